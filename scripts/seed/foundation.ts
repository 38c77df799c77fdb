import { db } from "../../db";
import type { Project, User } from "../../db/models/foundation";
import { createUser, findUserByEmail } from "../../app/services/users.server";
import type { ProjectRole } from "../../app/utils/permissions";

export const DEMO_PASSWORD = "thermotally-demo";

export const DEMO_ACCOUNTS: { email: string; name: string; role: ProjectRole | null; siteAdmin: boolean; what: string }[] = [
  { email: "admin@demo.test", name: "Ada Admin", role: null, siteAdmin: true, what: "site admin" },
  { email: "chemist@demo.test", name: "Mira Castell", role: "owner", siteAdmin: false, what: "owner of the demo project" },
  { email: "supervisor@demo.test", name: "Prof. Tomas Lindqvist", role: "auditor", siteAdmin: false, what: "auditor" },
  { email: "coauthor@demo.test", name: "Dr. Ines Varga", role: "viewer", siteAdmin: false, what: "viewer" },
];

export const DEMO_PROJECT_NAME = "Nickel-catalysed hydrocyanation of a vinylarene (demo)";
const DEMO_DESCRIPTION =
  "An invented study for trying Thermotally: a Ni(0)/phosphite cycle that adds HCN across 4-methoxystyrene — " +
  "oxidative addition of HCN, alkene insertion and reductive elimination of the branched nitrile. Energies " +
  "are plausible numbers made up for the demo, not results from any publication.";

export type DemoContext = { users: Record<string, User>; project: Project };

/** Demo accounts and the demo project; idempotent (existing rows are kept as they are). */
export async function seedFoundation(): Promise<DemoContext> {
  const { sequelize, models } = db();
  const users: Record<string, User> = {};
  for (const account of DEMO_ACCOUNTS) {
    users[account.email] =
      (await findUserByEmail(account.email)) ??
      (await createUser({ email: account.email, name: account.name, password: DEMO_PASSWORD, siteAdmin: account.siteAdmin }));
  }
  const owner = users["chemist@demo.test"];
  let project = await models.Project.findOne({ where: { name: DEMO_PROJECT_NAME } });
  if (!project) {
    project = await sequelize.transaction(async (transaction) => {
      const p = await models.Project.create({ name: DEMO_PROJECT_NAME, description: DEMO_DESCRIPTION, createdBy: owner.id }, { transaction });
      await models.HistoryEntry.create(
        { projectId: p.id, userId: owner.id, actorLabel: `${owner.name} <${owner.email}>`, action: "create", objectType: "project", objectId: p.id, summary: `Created project “${p.name}”` },
        { transaction },
      );
      return p;
    });
  }
  for (const account of DEMO_ACCOUNTS) {
    if (!account.role) continue;
    const user = users[account.email];
    const existing = await models.Membership.findOne({ where: { projectId: project.id, userId: user.id } });
    if (!existing) await models.Membership.create({ projectId: project.id, userId: user.id, role: account.role });
  }
  return { users, project };
}
