import { Op } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { ShareLink, Snapshot } from "../../db/models/team";
import { env } from "../utils/env.server";
import { ServiceError } from "../utils/http.server";
import { recordChange, type Principal } from "./history.server";
import { hashSecret, newSecret } from "./tokens.server";

/**
 * Read-only links for coauthors, to the live project or to one snapshot. The token is long and random
 * (newSecret) and only its SHA-256 is stored; a revoked or expired link stops at the next request.
 */
export const shareLinkInputSchema = z.object({
  label: z.string().trim().min(1, "Give the link a label (who it is for)").max(160, "At most 160 characters"),
  snapshotId: z.union([z.coerce.number().int().positive(), z.literal(""), z.null()]).optional()
    .transform((v) => (typeof v === "number" ? v : null)),
  expiresAt: z
    .union([z.string().trim(), z.null()])
    .optional()
    .transform((v, ctx) => {
      if (!v) return null;
      // A bare date means "until the end of that day" (UTC).
      const date = new Date(/^\d{4}-\d{2}-\d{2}$/.test(v) ? `${v}T23:59:59Z` : v);
      if (Number.isNaN(date.getTime())) {
        ctx.addIssue({ code: "custom", message: "Give a date such as 2030-01-31" });
        return z.NEVER;
      }
      if (date.getTime() <= Date.now()) {
        ctx.addIssue({ code: "custom", message: "The expiry must lie in the future" });
        return z.NEVER;
      }
      return date;
    }),
});

export type ShareLinkInput = z.input<typeof shareLinkInputSchema>;
export type ShareLinkState = "active" | "revoked" | "expired";

function stateOf(row: ShareLink): ShareLinkState {
  if (row.revokedAt) return "revoked";
  if (row.expiresAt && row.expiresAt.getTime() <= Date.now()) return "expired";
  return "active";
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

function describeShareLink(row: ShareLink) {
  return {
    id: row.id,
    label: row.label,
    prefix: row.prefix,
    snapshotId: row.snapshotId,
    state: stateOf(row),
    expiresAt: iso(row.expiresAt),
    revokedAt: iso(row.revokedAt),
    lastUsedAt: iso(row.lastUsedAt),
    createdAt: row.createdAt.toISOString(),
  };
}
export type ShareLinkView = ReturnType<typeof describeShareLink>;

export const shareUrl = (token: string) => `${env().APP_URL}/share/${encodeURIComponent(token)}`;

export async function listShareLinks(projectId: number): Promise<ShareLinkView[]> {
  const rows = await db().models.ShareLink.findAll({ where: { projectId }, order: [["id", "DESC"]] });
  return rows.map(describeShareLink);
}

/** Creates a link; the token and URL are returned this once and never again. */
export async function createShareLink(project: Project, by: Principal, input: z.input<typeof shareLinkInputSchema>) {
  const data = shareLinkInputSchema.parse(input);
  const { sequelize, models } = db();
  const token = newSecret("share");
  const row = await sequelize.transaction(async (transaction) => {
    if (data.snapshotId !== null) {
      const snapshot = await models.Snapshot.findOne({ where: { id: data.snapshotId, projectId: project.id }, attributes: ["id"], transaction });
      if (!snapshot) {
        throw new ServiceError(422, "unknown_reference", "No such snapshot in this project", [
          { field: "snapshotId", message: "No such snapshot in this project" },
        ]);
      }
    }
    const created = await models.ShareLink.create(
      {
        projectId: project.id,
        snapshotId: data.snapshotId,
        tokenHash: hashSecret(token),
        prefix: token.slice(0, 12),
        label: data.label,
        createdBy: by.userId,
        expiresAt: data.expiresAt,
      },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "share_link",
      objectId: created.id,
      summary: `Created share link “${data.label}” to ${data.snapshotId ? `snapshot #${data.snapshotId}` : "the live project"}`,
      newValues: { label: data.label, snapshotId: data.snapshotId, expiresAt: iso(data.expiresAt) },
    });
    return created;
  });
  return { token, url: shareUrl(token), shareLink: describeShareLink(row) };
}

export async function revokeShareLink(project: Project, by: Principal, linkId: number): Promise<ShareLinkView> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const row = await models.ShareLink.findOne({ where: { id: linkId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new ServiceError(404, "not_found", "No such share link");
    if (!row.revokedAt) {
      await row.update({ revokedAt: new Date() }, { transaction });
      await recordChange(transaction, by, {
        projectId: project.id,
        action: "update",
        objectType: "share_link",
        objectId: row.id,
        summary: `Revoked share link “${row.label}”`,
        oldValues: { revokedAt: null },
        newValues: { revokedAt: iso(row.revokedAt) },
      });
    }
    return describeShareLink(row);
  });
}

export type ResolvedShare = { link: ShareLink; project: Project; snapshot: Snapshot | null };

/**
 * The project (and snapshot) behind a share token, or null when the token is unknown, revoked or
 * expired: the link then works no more, from this request on. Records the use (at most once a minute).
 */
export async function resolveShareLink(token: string): Promise<ResolvedShare | null> {
  const { models } = db();
  const link = await models.ShareLink.findOne({
    where: {
      tokenHash: hashSecret(token),
      revokedAt: { [Op.is]: null },
      [Op.or]: [{ expiresAt: { [Op.is]: null } }, { expiresAt: { [Op.gt]: new Date() } }],
    },
  });
  if (!link) return null;
  const [project, snapshot] = await Promise.all([
    models.Project.findByPk(link.projectId),
    link.snapshotId ? models.Snapshot.findOne({ where: { id: link.snapshotId, projectId: link.projectId } }) : null,
  ]);
  if (!project || (link.snapshotId && !snapshot)) return null;
  if (!link.lastUsedAt || Date.now() - link.lastUsedAt.getTime() > 60_000) {
    await link.update({ lastUsedAt: new Date() }, { silent: true });
  }
  return { link, project, snapshot };
}
