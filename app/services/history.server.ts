import { Op, type Transaction, type WhereOptions } from "sequelize";
import { db } from "../../db";
import type { HistoryEntry } from "../../db/models/foundation";

/** Who made a change, as the history records it. */
export type Principal = { userId: number | null; label: string };

export type ChangeRecord = {
  projectId: number | null;
  action: "create" | "update" | "delete";
  objectType: string;
  objectId: number | null;
  summary: string;
  oldValues?: unknown;
  newValues?: unknown;
};

/** Writes one history row inside the caller's transaction, so a change and its record stand or fall together. */
export async function recordChange(tx: Transaction, by: Principal, change: ChangeRecord): Promise<void> {
  await recordChanges(tx, by, [change]);
}

export async function recordChanges(tx: Transaction, by: Principal, changes: ChangeRecord[]): Promise<void> {
  if (!changes.length) return;
  const { HistoryEntry } = db().models;
  await HistoryEntry.bulkCreate(
    changes.map((c) => ({
      projectId: c.projectId,
      userId: by.userId,
      actorLabel: by.label,
      action: c.action,
      objectType: c.objectType,
      objectId: c.objectId,
      summary: c.summary.slice(0, 500),
      oldValues: (c.oldValues ?? null) as object | null,
      newValues: (c.newValues ?? null) as object | null,
    })),
    { transaction: tx },
  );
}

/** The values of a model row as plain JSON for the history, without bookkeeping columns. */
export function snapshotOf(row: { get(options: { plain: true }): object }, omit: string[] = []): Record<string, unknown> {
  const plain = { ...(row.get({ plain: true }) as Record<string, unknown>) };
  for (const key of ["createdAt", "updatedAt", "passwordHash", "tokenHash", ...omit]) delete plain[key];
  return plain;
}

export type HistoryFilter = { objectType?: string; objectId?: number; userId?: number; limit?: number; before?: number };

export async function listHistory(projectId: number, filter: HistoryFilter = {}) {
  const { HistoryEntry } = db().models;
  const where: WhereOptions<HistoryEntry> = { projectId };
  if (filter.objectType) Object.assign(where, { objectType: filter.objectType });
  if (filter.objectId) Object.assign(where, { objectId: filter.objectId });
  if (filter.userId) Object.assign(where, { userId: filter.userId });
  if (filter.before) Object.assign(where, { id: { [Op.lt]: filter.before } });
  const rows = await HistoryEntry.findAll({
    where,
    order: [["id", "DESC"]],
    limit: Math.min(filter.limit ?? 200, 1000),
  });
  return rows.map((r) => ({
    id: r.id,
    at: r.createdAt.toISOString(),
    userId: r.userId,
    actor: r.actorLabel,
    action: r.action,
    objectType: r.objectType,
    objectId: r.objectId,
    summary: r.summary,
    oldValues: parseJsonColumn(r.oldValues),
    newValues: parseJsonColumn(r.newValues),
  }));
}

/** MariaDB keeps JSON as LONGTEXT; depending on the driver path it may come back as text. */
export function parseJsonColumn(value: unknown): unknown {
  if (typeof value !== "string") return value;
  try {
    return JSON.parse(value);
  } catch {
    return value;
  }
}
