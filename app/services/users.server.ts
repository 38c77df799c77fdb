import bcrypt from "bcryptjs";
import { Op, UniqueConstraintError } from "sequelize";
import { db } from "../../db";
import type { User } from "../../db/models/foundation";
import { env } from "../utils/env.server";
import { ServiceError } from "../utils/http.server";
import { sendMail } from "./mail.server";
import { RateLimiter } from "./rate-limit.server";
import { hashSecret, newSecret } from "./tokens.server";

import { z } from "zod";

// bcrypt reads only the first 72 bytes: a longer password is refused rather than cut silently.
export const passwordSchema = z
  .string()
  .min(10, "Use at least 10 characters")
  .refine((p) => Buffer.byteLength(p, "utf8") <= 72, "Passwords are at most 72 bytes");

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, env().BCRYPT_COST);
}

export async function createUser(input: { email: string; name: string; password: string; siteAdmin?: boolean }) {
  const { User } = db().models;
  try {
    return await User.create({
      email: normaliseEmail(input.email),
      name: input.name.trim(),
      passwordHash: await hashPassword(input.password),
      siteAdmin: input.siteAdmin ?? false,
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      throw new ServiceError(409, "email_taken", "An account with this e-mail already exists", [
        { field: "email", message: "An account with this e-mail already exists" },
      ]);
    }
    throw error;
  }
}

export const findUserByEmail = (email: string) => db().models.User.findOne({ where: { email: normaliseEmail(email) } });
export const findUserById = (id: number) => db().models.User.findByPk(id);

let limiters: { email: RateLimiter; address: RateLimiter } | undefined;
function signInLimiters() {
  if (!limiters) {
    const e = env();
    limiters = {
      email: new RateLimiter(e.SIGNIN_RATE_LIMIT_PER_EMAIL, e.SIGNIN_RATE_WINDOW_SECONDS * 1000),
      address: new RateLimiter(e.SIGNIN_RATE_LIMIT_PER_ADDRESS, e.SIGNIN_RATE_WINDOW_SECONDS * 1000),
    };
  }
  return limiters;
}

// Compared against when the e-mail is unknown, so that case costs the same bcrypt time as a wrong password.
let dummyHash: string | undefined;
const timingDummy = () => (dummyHash ??= bcrypt.hashSync("not-a-password", env().BCRYPT_COST));

export const INVALID_CREDENTIALS = "That e-mail and password do not match an account";

/**
 * Checks e-mail and password. Unknown e-mail and wrong password give the same message; attempts are
 * limited per e-mail and per client address, and a success clears the e-mail's count.
 */
export async function verifyCredentials(email: string, password: string, clientAddress: string): Promise<User> {
  const key = normaliseEmail(email);
  const { email: perEmail, address: perAddress } = signInLimiters();
  const emailOk = perEmail.take(key);
  const addressOk = perAddress.take(clientAddress);
  if (!emailOk || !addressOk) {
    const wait = Math.max(perEmail.retryAfterSeconds(key), perAddress.retryAfterSeconds(clientAddress));
    throw new ServiceError(429, "too_many_attempts", `Too many sign-in attempts; try again in ${Math.ceil(wait / 60)} minutes`);
  }
  const user = await findUserByEmail(key);
  const matches = await bcrypt.compare(password, user?.passwordHash ?? timingDummy());
  if (!user || !matches) throw new ServiceError(422, "invalid_credentials", INVALID_CREDENTIALS);
  perEmail.reset(key);
  return user;
}

const RESET_LIFETIME_MS = 60 * 60 * 1000;

/** Sends a one-time, expiring reset link. Says nothing about whether the e-mail has an account. */
export async function requestPasswordReset(email: string): Promise<void> {
  const user = await findUserByEmail(email);
  if (!user) return;
  const { PasswordReset } = db().models;
  const token = newSecret("reset");
  await PasswordReset.create({ userId: user.id, tokenHash: hashSecret(token), expiresAt: new Date(Date.now() + RESET_LIFETIME_MS) });
  const link = `${env().APP_URL}/reset-password/${encodeURIComponent(token)}`;
  await sendMail({
    to: user.email,
    subject: "Reset your Thermotally password",
    text:
      `Hello ${user.name},\n\nSomeone asked to reset the password of your Thermotally account. ` +
      `Open this link within one hour to choose a new one:\n\n${link}\n\n` +
      `The link works once. If you did not ask for it, ignore this message; your password stays as it is.\n`,
  });
}

export type ResetTokenState = "valid" | "unknown" | "used" | "expired";

export async function resetTokenState(token: string): Promise<ResetTokenState> {
  const row = await db().models.PasswordReset.findOne({ where: { tokenHash: hashSecret(token) } });
  if (!row) return "unknown";
  if (row.usedAt) return "used";
  if (row.expiresAt.getTime() < Date.now()) return "expired";
  return "valid";
}

/** Uses a reset link once: sets the new password, ends other sessions and voids other open links. */
export async function completePasswordReset(token: string, password: string): Promise<User> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const row = await models.PasswordReset.findOne({
      where: { tokenHash: hashSecret(token) },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const state: ResetTokenState = !row ? "unknown" : row.usedAt ? "used" : row.expiresAt.getTime() < Date.now() ? "expired" : "valid";
    if (state !== "valid" || !row) throw new ServiceError(422, `reset_${state}`, resetStateMessage(state));
    const user = await models.User.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new ServiceError(422, "reset_unknown", resetStateMessage("unknown"));
    await user.update({ passwordHash: await hashPassword(password), sessionVersion: user.sessionVersion + 1 }, { transaction });
    await models.PasswordReset.update(
      { usedAt: new Date() },
      { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction },
    );
    return user;
  });
}

export function resetStateMessage(state: ResetTokenState): string {
  switch (state) {
    case "used":
      return "This reset link has already been used. Ask for a new one.";
    case "expired":
      return "This reset link has expired. Ask for a new one.";
    case "unknown":
      return "This reset link is not valid. Ask for a new one.";
    default:
      return "";
  }
}

export async function listUsers() {
  const rows = await db().models.User.findAll({ order: [["email", "ASC"]] });
  return rows.map((u) => ({ id: u.id, email: u.email, name: u.name, siteAdmin: u.siteAdmin, createdAt: u.createdAt.toISOString() }));
}
