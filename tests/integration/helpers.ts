/**
 * Helpers for integration tests: real HTTP against the app that `npm test` serves at TEST_BASE_URL,
 * backed by the test MariaDB. Tests create their own projects so they never depend on each other.
 */
export const BASE_URL = (process.env.TEST_BASE_URL ?? "http://localhost:3100").replace(/\/$/, "");
export const DEMO_PASSWORD = "thermotally-demo";
export const DEMO = {
  admin: "admin@demo.test",
  chemist: "chemist@demo.test",
  supervisor: "supervisor@demo.test",
  coauthor: "coauthor@demo.test",
} as const;

export type ApiResult<T = any> = { status: number; body: T; headers: Headers };

export async function api<T = any>(
  path: string,
  options: { method?: string; token?: string; body?: unknown; headers?: Record<string, string>; raw?: BodyInit } = {},
): Promise<ApiResult<T>> {
  const headers: Record<string, string> = { ...(options.headers ?? {}) };
  if (options.token) headers.Authorization = `Bearer ${options.token}`;
  let body: BodyInit | undefined = options.raw;
  if (options.body !== undefined) {
    headers["Content-Type"] = "application/json";
    body = JSON.stringify(options.body);
  }
  const res = await fetch(BASE_URL + path, { method: options.method ?? (body ? "POST" : "GET"), headers, body, redirect: "manual" });
  const text = await res.text();
  let parsed: unknown = text;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    /* not JSON: keep the text */
  }
  return { status: res.status, body: parsed as T, headers: res.headers };
}

const tokens = new Map<string, string>();

/** A personal API token for a user, through POST /api/v1/session (cached per e-mail). */
export async function tokenFor(email: string, password = DEMO_PASSWORD): Promise<string> {
  const cached = tokens.get(email);
  if (cached) return cached;
  const res = await api<{ token: string }>("/api/v1/session", { body: { email, password } });
  if (res.status !== 201) throw new Error(`sign-in for ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  tokens.set(email, res.body.token);
  return res.body.token;
}

let counter = 0;
export const unique = (prefix: string) => `${prefix}-${Date.now().toString(36)}-${(counter++).toString(36)}`;

/** Signs a new user up through the page's form and returns the session cookie. */
export async function signUp(email: string, password = "correct horse battery", name = "Test Person"): Promise<string> {
  const form = new URLSearchParams({ name, email, password, confirm: password });
  const res = await fetch(`${BASE_URL}/sign-up`, {
    method: "POST",
    body: form,
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    redirect: "manual",
  });
  const cookie = res.headers.get("set-cookie");
  if (!cookie) throw new Error(`sign-up for ${email} gave no session (${res.status})`);
  return cookie.split(";")[0];
}

/** A new project owned by `ownerEmail`, with the other demo accounts added in the given roles. */
export async function newProject(
  ownerEmail: string = DEMO.chemist,
  members: { email: string; role: "owner" | "editor" | "auditor" | "viewer" }[] = [],
): Promise<{ id: number; token: string }> {
  const token = await tokenFor(ownerEmail);
  const res = await api("/api/v1/projects", { token, body: { name: unique("project") } });
  if (res.status !== 201) throw new Error(`project creation failed: ${res.status} ${JSON.stringify(res.body)}`);
  const id = res.body.project.id as number;
  for (const m of members) {
    const form = new URLSearchParams({ intent: "add", email: m.email, role: m.role });
    const r = await fetch(`${BASE_URL}/projects/${id}/members`, {
      method: "POST",
      body: form,
      headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
      redirect: "manual",
    });
    if (r.status >= 400) throw new Error(`adding ${m.email} failed: ${r.status}`);
  }
  return { id, token };
}
