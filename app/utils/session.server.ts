import { createCookieSessionStorage } from "react-router";
import { env } from "./env.server";

type SessionData = { userId: number; sessionVersion: number };
type SessionFlash = { notice: string };

let storage: ReturnType<typeof createCookieSessionStorage<SessionData, SessionFlash>> | undefined;

/** A signed cookie session: httpOnly, SameSite=Lax, Secure when the app is served over https. */
export function sessionStorage() {
  if (storage) return storage;
  const e = env();
  storage = createCookieSessionStorage<SessionData, SessionFlash>({
    cookie: {
      name: "thermotally_session",
      httpOnly: true,
      sameSite: "lax",
      secure: e.COOKIE_SECURE,
      path: "/",
      secrets: [e.SESSION_SECRET],
      maxAge: 60 * 60 * 24 * 14,
    },
  });
  return storage;
}

export const getSession = (request: Request) => sessionStorage().getSession(request.headers.get("Cookie"));
