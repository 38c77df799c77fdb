import { Sequelize } from "sequelize";
import { env } from "../app/utils/env.server";
import { initModels, type Models } from "./models";

/**
 * One Sequelize instance per process. DECIMAL columns come back as strings (energies stay exact end to
 * end, arithmetic happens in decimal.js) and ids as numbers: see the dialect options below.
 */
let instance: { sequelize: Sequelize; models: Models } | undefined;

export function db(): { sequelize: Sequelize; models: Models } {
  if (instance) return instance;
  const e = env();
  const sequelize = new Sequelize(e.DATABASE_URL, {
    dialect: "mariadb",
    logging: e.DB_LOG_SQL ? console.log : false,
    pool: { max: e.DB_POOL_MAX, min: 0, idle: 10_000 },
    dialectOptions: {
      supportBigNumbers: false,
      insertIdAsNumber: true,
      bigIntAsNumber: true,
      checkNumberRange: true,
    },
    timezone: "+00:00",
    define: { underscored: true },
  });
  instance = { sequelize, models: initModels(sequelize) };
  return instance;
}

export async function closeDb(): Promise<void> {
  if (instance) {
    await instance.sequelize.close();
    instance = undefined;
  }
}
