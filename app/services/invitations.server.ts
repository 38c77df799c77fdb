import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project, User } from "../../db/models/foundation";
import type { Invitation } from "../../db/models/team";
import { env } from "../utils/env.server";
import { ServiceError } from "../utils/http.server";
import { PROJECT_ROLES, type ProjectRole } from "../utils/permissions";
import { recordChange, type Principal } from "./history.server";
import { sendMail } from "./mail.server";
import { hashSecret, newSecret } from "./tokens.server";
import { hashPassword, normaliseEmail, passwordSchema } from "./users.server";

/**
 * Invitations by e-mail: an owner names an address and a role; the person receives a one-time link that
 * expires after a week. Following it, a new person creates an account (the e-mail is the invited one)
 * or a signed-in person accepts; either way they land in the project with that role.
 */
export const INVITATION_LIFETIME_DAYS = 7;

export const invitationInputSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254, "At most 254 characters"),
  role: z.enum(PROJECT_ROLES, { message: "Choose owner, editor, auditor or viewer" }),
});

export type InvitationState = "valid" | "unknown" | "used" | "expired" | "revoked";

function stateOf(row: Invitation | null): InvitationState {
  if (!row) return "unknown";
  if (row.acceptedAt) return "used";
  if (row.revokedAt) return "revoked";
  if (row.expiresAt.getTime() < Date.now()) return "expired";
  return "valid";
}

export function invitationStateMessage(state: InvitationState): string {
  switch (state) {
    case "used":
      return "This invitation has already been used. If you accepted it, sign in and open the project; otherwise ask the project's owner for a new one.";
    case "expired":
      return "This invitation has expired. Ask the project's owner to invite you again.";
    case "revoked":
      return "This invitation was withdrawn by the project's owner.";
    case "unknown":
      return "This invitation link is not valid. Check that you copied the whole link, or ask for a new one.";
    default:
      return "";
  }
}

function describeInvitation(row: Invitation) {
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    state: stateOf(row),
    expiresAt: row.expiresAt.toISOString(),
    acceptedAt: row.acceptedAt ? row.acceptedAt.toISOString() : null,
    revokedAt: row.revokedAt ? row.revokedAt.toISOString() : null,
    createdAt: row.createdAt.toISOString(),
  };
}
export type InvitationView = ReturnType<typeof describeInvitation>;

/** Invitations not yet accepted or withdrawn (expired ones stay listed, marked, until revoked). */
export async function listPendingInvitations(projectId: number): Promise<InvitationView[]> {
  const rows = await db().models.Invitation.findAll({
    where: { projectId, acceptedAt: { [Op.is]: null }, revokedAt: { [Op.is]: null } },
    order: [["id", "DESC"]],
  });
  return rows.map(describeInvitation);
}

export async function createInvitation(
  project: Project,
  inviter: User,
  by: Principal,
  input: z.input<typeof invitationInputSchema>,
): Promise<InvitationView> {
  const { email, role } = invitationInputSchema.parse(input);
  const { sequelize, models } = db();
  const token = newSecret("invite");
  const invitation = await sequelize.transaction(async (transaction) => {
    const existingUser = await models.User.findOne({ where: { email }, transaction });
    if (existingUser) {
      const member = await models.Membership.findOne({ where: { projectId: project.id, userId: existingUser.id }, transaction });
      if (member) {
        throw new ServiceError(409, "already_member", `${email} is already a member (${member.role})`, [
          { field: "email", message: `Already a member (${member.role})` },
        ]);
      }
    }
    // A new invitation to the same address replaces an open one, so only the latest link works.
    const open = await models.Invitation.findAll({
      where: { projectId: project.id, email, acceptedAt: { [Op.is]: null }, revokedAt: { [Op.is]: null } },
      transaction,
    });
    for (const old of open) await revokeRow(transaction, by, project.id, old, "replaced by a new invitation");
    const row = await models.Invitation.create(
      {
        projectId: project.id,
        email,
        role,
        tokenHash: hashSecret(token),
        invitedBy: inviter.id,
        expiresAt: new Date(Date.now() + INVITATION_LIFETIME_DAYS * 24 * 3600 * 1000),
      },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "invitation",
      objectId: row.id,
      summary: `Invited ${email} as ${role}`,
      newValues: { email, role, expiresAt: row.expiresAt.toISOString() },
    });
    return row;
  });
  const link = `${env().APP_URL}/invitations/${encodeURIComponent(token)}`;
  await sendMail({
    to: email,
    subject: `${inviter.name} invites you to “${project.name}” on Thermotally`,
    text:
      `Hello,\n\n${inviter.name} (${inviter.email}) invites you to join the Thermotally project “${project.name}” as ${role}.\n\n` +
      `Open this link within ${INVITATION_LIFETIME_DAYS} days to accept; you can create an account there if you have none:\n\n${link}\n\n` +
      `The link works once. If you did not expect this message, ignore it.\n`,
  });
  return describeInvitation(invitation);
}

async function revokeRow(tx: Transaction, by: Principal, projectId: number, row: Invitation, why: string) {
  await row.update({ revokedAt: new Date() }, { transaction: tx });
  await recordChange(tx, by, {
    projectId,
    action: "update",
    objectType: "invitation",
    objectId: row.id,
    summary: `Withdrew the invitation of ${row.email} (${why})`,
    oldValues: { revokedAt: null },
    newValues: { revokedAt: row.revokedAt?.toISOString() },
  });
}

export async function revokeInvitation(project: Project, by: Principal, invitationId: number): Promise<InvitationView> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const row = await models.Invitation.findOne({
      where: { id: invitationId, projectId: project.id },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!row) throw new ServiceError(404, "not_found", "No such invitation");
    if (row.acceptedAt) throw new ServiceError(409, "invitation_used", "This invitation has already been accepted; remove the member instead");
    if (!row.revokedAt) await revokeRow(transaction, by, project.id, row, "by an owner");
    return describeInvitation(row);
  });
}

/** What the invitation page shows before anything is done: its state and, when valid, what it offers. */
export async function lookUpInvitation(token: string) {
  const { models } = db();
  const row = await models.Invitation.findOne({ where: { tokenHash: hashSecret(token) } });
  const state = stateOf(row);
  if (!row || state !== "valid") return { state, message: invitationStateMessage(state), invitation: null };
  const [project, inviter, account] = await Promise.all([
    models.Project.findByPk(row.projectId),
    row.invitedBy ? models.User.findByPk(row.invitedBy) : null,
    models.User.findOne({ where: { email: row.email }, attributes: ["id"] }),
  ]);
  if (!project) return { state: "unknown" as const, message: invitationStateMessage("unknown"), invitation: null };
  return {
    state,
    message: "",
    invitation: {
      email: row.email,
      role: row.role,
      projectName: project.name,
      inviter: inviter ? inviter.name : "An owner",
      expiresAt: row.expiresAt.toISOString(),
      accountExists: Boolean(account),
    },
  };
}

/** Locks the invitation for the use at hand and refuses, plainly, a used, expired or withdrawn one. */
async function claim(tx: Transaction, token: string): Promise<Invitation> {
  const row = await db().models.Invitation.findOne({ where: { tokenHash: hashSecret(token) }, transaction: tx, lock: tx.LOCK.UPDATE });
  const state = stateOf(row);
  if (!row || state !== "valid") throw new ServiceError(422, `invitation_${state}`, invitationStateMessage(state));
  return row;
}

async function join(tx: Transaction, row: Invitation, user: User): Promise<{ projectId: number; role: ProjectRole }> {
  const { models } = db();
  const by: Principal = { userId: user.id, label: `${user.name} <${user.email}>` };
  const existing = await models.Membership.findOne({ where: { projectId: row.projectId, userId: user.id }, transaction: tx });
  let role: ProjectRole = row.role;
  if (existing) {
    // Already a member: the invitation is used up, the role an owner set stays as it is.
    role = existing.role;
  } else {
    const m = await models.Membership.create({ projectId: row.projectId, userId: user.id, role: row.role }, { transaction: tx });
    await recordChange(tx, by, {
      projectId: row.projectId,
      action: "create",
      objectType: "membership",
      objectId: m.id,
      summary: `${user.email} joined as ${row.role} through an invitation`,
      newValues: { email: user.email, role: row.role, invitationId: row.id },
    });
  }
  await row.update({ acceptedAt: new Date(), acceptedBy: user.id }, { transaction: tx });
  await recordChange(tx, by, {
    projectId: row.projectId,
    action: "update",
    objectType: "invitation",
    objectId: row.id,
    summary: `Invitation of ${row.email} accepted by ${user.email}`,
    oldValues: { acceptedAt: null },
    newValues: { acceptedAt: row.acceptedAt?.toISOString(), acceptedBy: user.id },
  });
  return { projectId: row.projectId, role };
}

/** A signed-in person accepts. */
export async function acceptInvitation(token: string, user: User) {
  return db().sequelize.transaction((tx) => claim(tx, token).then((row) => join(tx, row, user)));
}

export const newAccountSchema = z
  .object({
    name: z.string().trim().min(1, "Enter your name").max(120, "At most 120 characters"),
    password: passwordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

/** A new person creates an account under the invited address and joins, in one transaction. */
export async function acceptInvitationWithNewAccount(token: string, input: z.input<typeof newAccountSchema>) {
  const { name, password } = newAccountSchema.parse(input);
  const passwordHash = await hashPassword(password);
  const { sequelize, models } = db();
  return sequelize.transaction(async (tx) => {
    const row = await claim(tx, token);
    const email = normaliseEmail(row.email);
    if (await models.User.findOne({ where: { email }, transaction: tx })) {
      throw new ServiceError(409, "email_taken", "An account with this e-mail already exists: sign in to accept the invitation", [
        { field: "form", message: "An account with this e-mail already exists: sign in to accept the invitation" },
      ]);
    }
    const user = await models.User.create({ email, name, passwordHash }, { transaction: tx });
    const joined = await join(tx, row, user);
    return { user, ...joined };
  });
}
