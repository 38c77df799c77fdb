import { QueryTypes } from "sequelize";
import { db } from "../../db";

/** The database answers a trivial query within the time a load balancer waits. */
export async function checkHealth(): Promise<{ ok: boolean; database: string }> {
  try {
    await db().sequelize.query("SELECT 1 AS ok", { type: QueryTypes.SELECT });
    return { ok: true, database: "up" };
  } catch {
    return { ok: false, database: "down" };
  }
}
