import { redirect } from "react-router";
import { db } from "../../db";
import type { Project, User } from "../../db/models/foundation";
import { resolveShareLink } from "../services/share-links.server";
import { userForApiToken } from "../services/tokens.server";
import { findUserById } from "../services/users.server";
import { forbidden, notFound, unauthorized } from "./http.server";
import { canSee, may, type ProjectAction, type ProjectActor, type ProjectRole } from "./permissions";
import { getSession } from "./session.server";

/**
 * Route guards: each throws a Response when the request may not go on. Pages and API routes call the
 * same functions; for API paths the thrown Responses are JSON errors, for pages a redirect to sign-in.
 */
const isApi = (request: Request) => new URL(request.url).pathname.startsWith("/api/");

const resolved = new WeakMap<Request, Promise<User | null>>();

/** The signed-in user: a bearer token (scripts) or the session cookie (browser). */
export function currentUser(request: Request): Promise<User | null> {
  let pending = resolved.get(request);
  if (!pending) {
    pending = resolveUser(request);
    resolved.set(request, pending);
  }
  return pending;
}

async function resolveUser(request: Request): Promise<User | null> {
  const header = request.headers.get("Authorization");
  if (header) {
    const match = /^Bearer\s+(\S+)$/i.exec(header.trim());
    return match ? userForApiToken(match[1]) : null;
  }
  const session = await getSession(request);
  const userId = session.get("userId");
  if (!userId) return null;
  const user = await findUserById(userId);
  // A password change bumps the version and so ends every older session.
  if (!user || user.sessionVersion !== session.get("sessionVersion")) return null;
  return user;
}

export async function requireUser(request: Request): Promise<User> {
  const user = await currentUser(request);
  if (user) return user;
  if (isApi(request)) throw unauthorized();
  const url = new URL(request.url);
  throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
}

export async function requireSiteAdmin(request: Request): Promise<User> {
  const user = await requireUser(request);
  if (!user.siteAdmin) throw isApi(request) ? forbidden() : notFound();
  return user;
}

export type ProjectAccess = { user: User; project: Project; role: ProjectRole | null; actor: ProjectActor };

/** The role of a user in a project, or null for a non-member. */
export async function roleIn(projectId: number, userId: number): Promise<ProjectRole | null> {
  const m = await db().models.Membership.findOne({ where: { projectId, userId }, attributes: ["role"] });
  return m?.role ?? null;
}

/**
 * The project, if this user may do `action` there. A non-member gets 404 (the project's existence is
 * not revealed); a member without the right gets 403.
 */
export async function requireProject(request: Request, projectId: number, action: ProjectAction): Promise<ProjectAccess> {
  const user = await requireUser(request);
  const project = await db().models.Project.findByPk(projectId);
  if (!project) throw notFound("No such project");
  const role = await roleIn(project.id, user.id);
  const actor: ProjectActor = { kind: "user", siteAdmin: user.siteAdmin, role };
  if (!canSee(actor)) throw notFound("No such project");
  if (!may(actor, action)) throw forbidden(`Your role in this project (${role ?? "site admin"}) may not ${actionWords[action]}`);
  return { user, project, role, actor };
}

const actionWords: Record<ProjectAction, string> = {
  read: "read it",
  export: "export it",
  edit: "change its data",
  review: "sign off or review findings",
  comment: "comment",
  manage: "manage members, share links or the project itself",
};

export const principalOf = (user: User) => ({ userId: user.id, label: `${user.name} <${user.email}>` });

/**
 * A share link's view of its project: only what `may({kind: "share"}, action)` allows (read, export).
 * An unknown, revoked or expired token is "not found", so a link stops working at once.
 */
export async function requireShare(request: Request, token: string, action: ProjectAction) {
  if (request.method !== "GET" && request.method !== "HEAD") throw forbidden("A share link only reads and exports");
  const share = await resolveShareLink(token);
  if (!share) throw notFound("This share link is not valid: it may have been revoked or have expired");
  const actor: ProjectActor = { kind: "share" };
  if (!may(actor, action)) throw forbidden("A share link only reads and exports");
  return { ...share, actor };
}
