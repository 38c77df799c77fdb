import { Op, type WhereOptions } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Comment, FindingAcceptance } from "../../db/models/team";
import { ServiceError } from "../utils/http.server";
import { recordChange, type Principal } from "./history.server";

/**
 * Comments on audit findings and reactions, and auditors' acceptances of findings. A finding is named
 * by its key (rule code and the object it concerns, see `findingKey`), since findings are computed
 * afresh on every audit and have no row of their own; an acceptance stays attached to that key.
 */

/** The stable name of a finding: its rule code and the object it concerns, e.g. "ts_imaginary_modes:species:12". */
export function findingKey(finding: { code: string; object: { type: string; id: number } }): string {
  return `${finding.code}:${finding.object.type}:${finding.object.id}`;
}

const findingKeySchema = z
  .string()
  .trim()
  .min(1, "Name the finding")
  .max(300, "At most 300 characters")
  .regex(/^[A-Za-z0-9_.:/#-]+$/, "A finding key is its rule code and object, e.g. ts_imaginary_modes:species:12");

export const commentInputSchema = z
  .object({
    targetType: z.enum(["finding", "reaction"], { message: "Comment on a finding or a reaction" }),
    targetKey: z.union([z.string().trim(), z.number()]).transform(String),
    body: z.string().trim().min(1, "Write something").max(5000, "At most 5000 characters"),
  })
  .superRefine((v, ctx) => {
    const ok = v.targetType === "reaction" ? /^[1-9]\d{0,9}$/.test(v.targetKey) : findingKeySchema.safeParse(v.targetKey).success;
    if (!ok) {
      const message = v.targetType === "reaction" ? "Name the reaction by its id" : "A finding key is its rule code and object, e.g. ts_imaginary_modes:species:12";
      ctx.addIssue({ code: "custom", path: ["targetKey"], message });
    }
  });

export const acceptanceInputSchema = z.object({
  findingKey: findingKeySchema,
  reason: z.string().trim().min(1, "Say why the finding is acceptable").max(2000, "At most 2000 characters"),
});

/** The name part of a history principal label ("Name <email>"), as shown beside comments and signatures. */
export const actorName = (label: string) => label.replace(/\s*<[^>]*>$/, "");

function describeComment(c: Comment) {
  return {
    id: c.id,
    targetType: c.targetType,
    targetKey: c.targetKey,
    author: actorName(c.authorLabel),
    authorId: c.authorId,
    body: c.body,
    createdAt: c.createdAt.toISOString(),
  };
}
export type CommentView = ReturnType<typeof describeComment>;

function describeAcceptance(a: FindingAcceptance) {
  return {
    id: a.id,
    findingKey: a.findingKey,
    acceptedBy: actorName(a.acceptedByLabel),
    reason: a.reason,
    createdAt: a.createdAt.toISOString(),
  };
}
export type AcceptanceView = ReturnType<typeof describeAcceptance>;

/** How an accepted finding reads in the workbook's audit sheet. */
export function acceptanceNote(acceptance: AcceptanceView | null | undefined): string {
  return acceptance ? ` [accepted by ${acceptance.acceptedBy} on ${acceptance.createdAt.slice(0, 10)}: ${acceptance.reason}]` : "";
}

export async function listComments(projectId: number, filter: { targetType?: "finding" | "reaction"; targetKey?: string } = {}) {
  const where: WhereOptions<Comment> = { projectId };
  if (filter.targetType) Object.assign(where, { targetType: filter.targetType });
  if (filter.targetKey) Object.assign(where, { targetKey: filter.targetKey });
  const rows = await db().models.Comment.findAll({ where, order: [["id", "ASC"]] });
  return rows.map(describeComment);
}

export async function addComment(project: Project, by: Principal, input: z.input<typeof commentInputSchema>): Promise<CommentView> {
  const data = commentInputSchema.parse(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    if (data.targetType === "reaction") {
      const reaction = await models.Reaction.findOne({ where: { id: Number(data.targetKey), projectId: project.id }, attributes: ["id"], transaction });
      if (!reaction) {
        throw new ServiceError(422, "unknown_reference", "No such reaction in this project", [
          { field: "targetKey", message: "No such reaction in this project" },
        ]);
      }
    }
    const row = await models.Comment.create(
      { projectId: project.id, targetType: data.targetType, targetKey: data.targetKey, authorId: by.userId, authorLabel: by.label, body: data.body },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "comment",
      objectId: row.id,
      summary: `Commented on ${data.targetType === "reaction" ? `reaction #${data.targetKey}` : `finding ${data.targetKey}`}`,
      newValues: { targetType: data.targetType, targetKey: data.targetKey, body: data.body },
    });
    return describeComment(row);
  });
}

/** Acceptances in force (not revoked), keyed by finding key. */
export async function activeAcceptances(projectId: number): Promise<Map<string, AcceptanceView>> {
  const rows = await db().models.FindingAcceptance.findAll({
    where: { projectId, revokedAt: { [Op.is]: null } },
    order: [["id", "ASC"]],
  });
  return new Map(rows.map((r) => [r.findingKey, describeAcceptance(r)]));
}

export async function listAcceptances(projectId: number): Promise<AcceptanceView[]> {
  return [...(await activeAcceptances(projectId)).values()];
}

/** Marks a finding accepted with a reason; a second acceptance of the same key replaces the first. */
export async function acceptFinding(project: Project, by: Principal, input: z.input<typeof acceptanceInputSchema>): Promise<AcceptanceView> {
  const { findingKey: key, reason } = acceptanceInputSchema.parse(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const previous = await models.FindingAcceptance.findAll({
      where: { projectId: project.id, findingKey: key, revokedAt: { [Op.is]: null } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    for (const p of previous) await p.update({ revokedAt: new Date(), revokedBy: by.userId }, { transaction });
    const row = await models.FindingAcceptance.create(
      { projectId: project.id, findingKey: key, acceptedBy: by.userId, acceptedByLabel: by.label, reason },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "finding_acceptance",
      objectId: row.id,
      summary: `Accepted finding ${key}: ${reason}`,
      oldValues: previous.length ? { reason: previous[previous.length - 1].reason } : null,
      newValues: { findingKey: key, reason },
    });
    return describeAcceptance(row);
  });
}

export async function revokeAcceptance(project: Project, by: Principal, key: string): Promise<void> {
  const findingKeyParsed = findingKeySchema.parse(key);
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const rows = await models.FindingAcceptance.findAll({
      where: { projectId: project.id, findingKey: findingKeyParsed, revokedAt: { [Op.is]: null } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!rows.length) throw new ServiceError(404, "not_found", "This finding is not marked accepted");
    for (const row of rows) {
      await row.update({ revokedAt: new Date(), revokedBy: by.userId }, { transaction });
      await recordChange(transaction, by, {
        projectId: project.id,
        action: "update",
        objectType: "finding_acceptance",
        objectId: row.id,
        summary: `Withdrew the acceptance of finding ${row.findingKey}`,
        oldValues: { reason: row.reason, revokedAt: null },
        newValues: { revokedAt: row.revokedAt?.toISOString() },
      });
    }
  });
}
