import type { Model, Transaction } from "sequelize";
import { ServiceError } from "../utils/http.server";
import { recordChange, snapshotOf, type Principal } from "./history.server";

/**
 * Optimistic locking for every editable ledger row: an edit names the version it was based on; when
 * the row has moved on, it is refused with 409 and the current values, so two editors never silently
 * overwrite each other. The update and its history row share the caller's transaction.
 */
export async function updateVersioned<M extends Model & { version: number; id: number }>(
  tx: Transaction,
  by: Principal,
  row: M,
  expectedVersion: number | undefined,
  changes: Partial<M["_attributes"]>,
  history: { projectId: number; objectType: string; summary: string; omit?: string[] },
): Promise<M> {
  // Re-read under a row lock: two edits of the same version that arrive together are then serialised,
  // and the second one sees the first one's version and is refused instead of overwriting it.
  await row.reload({ transaction: tx, lock: tx.LOCK.UPDATE });
  if (expectedVersion !== undefined && expectedVersion !== row.version) {
    throw new ServiceError(
      409,
      "stale_version",
      `This ${history.objectType} was changed by someone else (your version ${expectedVersion}, current ${row.version}); reload and apply your edit again`,
      [],
      { current: snapshotOf(row, history.omit) },
    );
  }
  const old = snapshotOf(row, history.omit);
  await row.update({ ...changes, version: row.version + 1 } as never, { transaction: tx });
  const now = snapshotOf(row, history.omit);
  const changedOld: Record<string, unknown> = {};
  const changedNew: Record<string, unknown> = {};
  for (const key of Object.keys(now)) {
    if (key === "version") continue;
    if (JSON.stringify(old[key]) !== JSON.stringify(now[key])) {
      changedOld[key] = old[key];
      changedNew[key] = now[key];
    }
  }
  await recordChange(tx, by, {
    projectId: history.projectId,
    action: "update",
    objectType: history.objectType,
    objectId: row.id,
    summary: history.summary,
    oldValues: changedOld,
    newValues: changedNew,
  });
  return row;
}

/** Reads an optional `version` from an edit, accepting numbers and numeric strings. */
export function expectedVersionOf(input: { version?: unknown }): number | undefined {
  if (input.version === undefined || input.version === null || input.version === "") return undefined;
  const v = Number(input.version);
  if (!Number.isInteger(v) || v < 1) {
    throw new ServiceError(422, "invalid_input", "version must be a positive whole number", [{ field: "version", message: "must be a positive whole number" }]);
  }
  return v;
}
