import type { Model, Transaction } from "sequelize";
import { z } from "zod";
import { parseJsonBody, ServiceError } from "../utils/http.server";
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
  await assertVersion(tx, row, expectedVersion, history.objectType, history.omit, "apply your edit again");
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

/**
 * Re-reads the row under a lock and refuses (409, `stale_version`, with the current values) when it has
 * moved on from the version the caller saw. The lock serialises two requests based on the same version,
 * so the second one sees the first one's change and is refused. Without an expected version (scripts)
 * it only locks. Edits and deletes share it.
 */
export async function assertVersion<M extends Model & { version: number }>(
  tx: Transaction,
  row: M,
  expectedVersion: number | undefined,
  objectType: string,
  omit?: string[],
  retry = "try again",
): Promise<void> {
  await row.reload({ transaction: tx, lock: tx.LOCK.UPDATE });
  if (expectedVersion !== undefined && expectedVersion !== row.version) {
    throw new ServiceError(
      409,
      "stale_version",
      `This ${objectType} was changed by someone else (your version ${expectedVersion}, current ${row.version}); reload and ${retry}`,
      [],
      { current: snapshotOf(row, omit) },
    );
  }
}

/**
 * The version a DELETE was based on: `?version=N` or a JSON body `{"version": N}`; none when neither
 * is given (a delete from a script still works).
 */
export async function expectedVersionOfDelete(request: Request): Promise<number | undefined> {
  const body = await parseJsonBody(request, z.object({ version: z.unknown().optional() }));
  return expectedVersionOf({ version: body.version ?? new URL(request.url).searchParams.get("version") });
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
