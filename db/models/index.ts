import type { Sequelize } from "sequelize";
import { initFoundationModels } from "./foundation";

/**
 * Every model of the app, initialised on one Sequelize instance. Later parts of the app add their own
 * init function here; associations are declared inside each init function.
 */
export function initModels(sequelize: Sequelize) {
  const foundation = initFoundationModels(sequelize);
  return { ...foundation };
}

export type Models = ReturnType<typeof initModels>;
