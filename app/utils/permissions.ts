/**
 * The one place that answers "may this actor do this here" (PRODUCT.md §4). Pure: loaders, actions and
 * API routes ask through app/utils/guards.server.ts, and components use it only to hide what the server
 * would refuse anyway.
 */
export const PROJECT_ROLES = ["owner", "editor", "auditor", "viewer"] as const;
export type ProjectRole = (typeof PROJECT_ROLES)[number];

export type ProjectAction =
  | "read" // project, ledger, diagrams, audit, history
  | "export" // XLSX, CSV, SVG/PNG
  | "edit" // species, levels, calculations, protocols, reactions, pathways, import
  | "review" // comment on audit findings, sign off a snapshot
  | "comment" // comment on findings and reactions
  | "manage"; // members, share links, rename, delete

/** Who is asking, for one project: a signed-in user with a membership (or none), or a share link. */
export type ProjectActor =
  | { kind: "user"; siteAdmin: boolean; role: ProjectRole | null }
  | { kind: "share" };

const allowed: Record<ProjectAction, readonly ProjectRole[]> = {
  read: ["owner", "editor", "auditor", "viewer"],
  export: ["owner", "editor", "auditor", "viewer"],
  edit: ["owner", "editor"],
  review: ["owner", "auditor"],
  comment: ["owner", "editor", "auditor"],
  manage: ["owner"],
};

const shareLinkMay: ReadonlySet<ProjectAction> = new Set(["read", "export"]);

export function may(actor: ProjectActor, action: ProjectAction): boolean {
  if (actor.kind === "share") return shareLinkMay.has(action);
  if (actor.siteAdmin) return true;
  return actor.role !== null && allowed[action].includes(actor.role);
}

/** A non-member must not learn that a project exists: it is "not found", not "forbidden". */
export function canSee(actor: ProjectActor): boolean {
  return actor.kind === "share" || actor.siteAdmin || actor.role !== null;
}

export function mayManageUsers(user: { siteAdmin: boolean }): boolean {
  return user.siteAdmin;
}

/** What a role may do, for the members page and the README's table. */
export function actionsOf(role: ProjectRole): ProjectAction[] {
  return (Object.keys(allowed) as ProjectAction[]).filter((a) => allowed[a].includes(role));
}

export const ROLE_DESCRIPTIONS: Record<ProjectRole, string> = {
  owner: "Everything, including members, share links and deleting the project",
  editor: "Adds and edits species, levels, calculations, protocols, reactions and pathways",
  auditor: "Reads everything, comments on findings and signs off snapshots",
  viewer: "Reads everything and exports; changes nothing",
};
