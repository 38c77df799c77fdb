import type { QueryInterface } from "sequelize";
import * as m001 from "./001-foundation";

type Step = (params: { context: QueryInterface }) => Promise<void>;

/**
 * Every migration, in order. A list in code (not a glob) works alike under vitest, tsx and the server
 * bundle. Add a new file as NNN-name.ts and append it here.
 */
export const migrations: { name: string; up: Step; down: Step }[] = [
  { name: "001-foundation", ...m001 },
];
