import { redirect } from "react-router";
import type { User } from "../../db/models/foundation";
import { getSession, sessionStorage } from "../utils/session.server";

/** Only same-site paths are followed after sign-in, so a crafted link cannot send a user elsewhere. */
export function safeNext(next: string | null | undefined, fallback = "/projects"): string {
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) return fallback;
  return next;
}

export async function signInAndRedirect(request: Request, user: User, next: string): Promise<Response> {
  const session = await getSession(request);
  session.set("userId", user.id);
  session.set("sessionVersion", user.sessionVersion);
  return redirect(safeNext(next), { headers: { "Set-Cookie": await sessionStorage().commitSession(session) } });
}

export async function signOutAndRedirect(request: Request, to = "/"): Promise<Response> {
  const session = await getSession(request);
  return redirect(to, { headers: { "Set-Cookie": await sessionStorage().destroySession(session) } });
}
