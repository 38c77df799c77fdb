import { Op } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project, User } from "../../db/models/foundation";
import { ServiceError } from "../utils/http.server";
import { PROJECT_ROLES, type ProjectRole } from "../utils/permissions";
import { recordChange, snapshotOf, type Principal } from "./history.server";
import { findUserByEmail } from "./users.server";

export const projectInputSchema = z.object({
  name: z.string().trim().min(1, "Give the project a name").max(160, "At most 160 characters"),
  description: z.string().trim().max(5000, "At most 5000 characters").optional().default(""),
});
export type ProjectInput = z.input<typeof projectInputSchema>;

export function describeProject(p: Project, role: ProjectRole | null) {
  return {
    id: p.id,
    name: p.name,
    description: p.description,
    role,
    defaultProtocolId: p.defaultProtocolId ?? null,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

/** The projects a user belongs to (a site admin sees every project). */
export async function listProjectsFor(user: User) {
  const { Project, Membership } = db().models;
  const memberships = await Membership.findAll({ where: { userId: user.id } });
  const roles = new Map(memberships.map((m) => [m.projectId, m.role]));
  const projects = await Project.findAll({
    where: user.siteAdmin ? {} : { id: { [Op.in]: [...roles.keys()] } },
    order: [["updatedAt", "DESC"]],
  });
  return projects.map((p) => describeProject(p, roles.get(p.id) ?? null));
}

/** Creates a project with its creator as owner, in one transaction with its history row. */
export async function createProject(user: User, by: Principal, input: ProjectInput) {
  const data = projectInputSchema.parse(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const project = await models.Project.create({ ...data, createdBy: user.id }, { transaction });
    await models.Membership.create({ projectId: project.id, userId: user.id, role: "owner" }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "project",
      objectId: project.id,
      summary: `Created project “${project.name}”`,
      newValues: snapshotOf(project),
    });
    return describeProject(project, "owner");
  });
}

export async function updateProject(project: Project, by: Principal, input: ProjectInput) {
  const data = projectInputSchema.parse(input);
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const old = snapshotOf(project);
    await project.update({ ...data, version: project.version + 1 }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "update",
      objectType: "project",
      objectId: project.id,
      summary: `Renamed or described project “${project.name}”`,
      oldValues: old,
      newValues: snapshotOf(project),
    });
    return project;
  });
}

/** Deletes the project and everything in it (foreign keys cascade); the history row outlives it with no project. */
export async function deleteProject(project: Project, by: Principal) {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const old = snapshotOf(project);
    await project.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: null,
      action: "delete",
      objectType: "project",
      objectId: project.id,
      summary: `Deleted project “${project.name}”`,
      oldValues: old,
    });
  });
}

export async function listMembers(projectId: number) {
  const { Membership, User } = db().models;
  const rows = await Membership.findAll({
    where: { projectId },
    include: [{ model: User, as: "user", attributes: ["id", "email", "name"] }],
    order: [["id", "ASC"]],
  });
  return rows.map((m) => {
    const u = (m as unknown as { user: User }).user;
    return { id: m.id, userId: m.userId, email: u.email, name: u.name, role: m.role };
  });
}

export const memberInputSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address"),
  role: z.enum(PROJECT_ROLES, { message: "Choose owner, editor, auditor or viewer" }),
});

export async function addMember(project: Project, by: Principal, input: z.input<typeof memberInputSchema>) {
  const { email, role } = memberInputSchema.parse(input);
  const user = await findUserByEmail(email);
  if (!user) {
    throw new ServiceError(404, "no_such_user", "No account uses this e-mail; invite the person instead", [
      { field: "email", message: "No account uses this e-mail" },
    ]);
  }
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const existing = await models.Membership.findOne({ where: { projectId: project.id, userId: user.id }, transaction });
    if (existing) {
      throw new ServiceError(409, "already_member", `${email} is already a member (${existing.role})`, [
        { field: "email", message: `Already a member (${existing.role})` },
      ]);
    }
    const m = await models.Membership.create({ projectId: project.id, userId: user.id, role }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "membership",
      objectId: m.id,
      summary: `Added ${email} as ${role}`,
      newValues: { email, role },
    });
    return m;
  });
}

/**
 * The owners of a project, counted with their rows locked: two owners removing or demoting each other at
 * the same moment queue up here, so the second sees that only one owner is left.
 */
async function ownerCount(projectId: number, transaction: import("sequelize").Transaction) {
  const owners = await db().models.Membership.findAll({
    where: { projectId, role: "owner" },
    attributes: ["id"],
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  return owners.length;
}

export async function changeMemberRole(project: Project, by: Principal, membershipId: number, role: ProjectRole) {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const m = await models.Membership.findOne({ where: { id: membershipId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!m) throw new ServiceError(404, "not_found", "No such member");
    if (m.role === role) return m;
    if (m.role === "owner" && (await ownerCount(project.id, transaction)) <= 1) {
      throw new ServiceError(409, "last_owner", "A project keeps at least one owner: make someone else owner first");
    }
    const old = m.role;
    await m.update({ role }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "update",
      objectType: "membership",
      objectId: m.id,
      summary: `Changed a member's role from ${old} to ${role}`,
      oldValues: { role: old },
      newValues: { role },
    });
    return m;
  });
}

export async function removeMember(project: Project, by: Principal, membershipId: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const m = await models.Membership.findOne({ where: { id: membershipId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!m) throw new ServiceError(404, "not_found", "No such member");
    if (m.role === "owner" && (await ownerCount(project.id, transaction)) <= 1) {
      throw new ServiceError(409, "last_owner", "The last owner cannot be removed: make someone else owner first");
    }
    await m.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "delete",
      objectType: "membership",
      objectId: m.id,
      summary: `Removed a member (${m.role})`,
      oldValues: { userId: m.userId, role: m.role },
    });
  });
}
