import { createHash, randomBytes } from "node:crypto";
import { db } from "../../db";
import type { User } from "../../db/models/foundation";
import { ServiceError } from "../utils/http.server";

/** Secrets (API tokens, reset links, share links) are long and random, and only their SHA-256 is stored. */
export function newSecret(prefix: string): string {
  return `${prefix}_${randomBytes(32).toString("base64url")}`;
}

export function hashSecret(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

export async function createApiToken(user: User, name: string) {
  const { ApiToken } = db().models;
  const token = newSecret("tt");
  const row = await ApiToken.create({ userId: user.id, name, tokenHash: hashSecret(token), prefix: token.slice(0, 10) });
  return { token, record: describeToken(row) };
}

function describeToken(row: InstanceType<ReturnType<typeof db>["models"]["ApiToken"]>) {
  return {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt ? row.lastUsedAt.toISOString() : null,
    revokedAt: row.revokedAt ? row.revokedAt.toISOString() : null,
  };
}

export async function listApiTokens(user: User) {
  const { ApiToken } = db().models;
  const rows = await ApiToken.findAll({ where: { userId: user.id }, order: [["id", "DESC"]] });
  return rows.map(describeToken);
}

export async function revokeApiToken(user: User, tokenId: number) {
  const { ApiToken } = db().models;
  const row = await ApiToken.findOne({ where: { id: tokenId, userId: user.id } });
  if (!row) throw new ServiceError(404, "not_found", "No such token");
  if (!row.revokedAt) await row.update({ revokedAt: new Date() });
}

/** The user behind a bearer token, or null when the token is unknown or revoked. */
export async function userForApiToken(token: string): Promise<User | null> {
  const { ApiToken, User } = db().models;
  const row = await ApiToken.findOne({ where: { tokenHash: hashSecret(token), revokedAt: null } });
  if (!row) return null;
  // Record use at most once a minute, so a busy script does not write on every request.
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > 60_000) {
    await row.update({ lastUsedAt: new Date() }, { silent: true });
  }
  return User.findByPk(row.userId);
}
