import type { Sequelize } from "sequelize";
import { initFoundationModels } from "./foundation";
import { initLedgerModels } from "./ledger";
import { initFileModels } from "./files";
import { initTeamModels } from "./team";

/**
 * Every model of the app, initialised on one Sequelize instance. Later parts of the app add their own
 * init function here; associations are declared inside each init function.
 */
export function initModels(sequelize: Sequelize) {
  const foundation = initFoundationModels(sequelize);
  const ledger = initLedgerModels(sequelize);
  const files = initFileModels(sequelize);
  const team = initTeamModels(sequelize);
  return { ...foundation, ...ledger, ...files, ...team };
}

export type Models = ReturnType<typeof initModels>;
