import type { QueryInterface } from "sequelize";
import * as m001 from "./001-foundation";
import * as m002 from "./002-ledger";
import * as m003 from "./003-files";
import * as m004 from "./004-team";

type Step = (params: { context: QueryInterface }) => Promise<void>;

/**
 * Every migration, in order. A list in code (not a glob) works alike under vitest, tsx and the server
 * bundle. Add a new file as NNN-name.ts and append it here.
 */
export const migrations: { name: string; up: Step; down: Step }[] = [
  { name: "001-foundation", ...m001 },
  { name: "002-ledger", ...m002 },
  { name: "003-files", ...m003 },
  { name: "004-team", ...m004 },
];
