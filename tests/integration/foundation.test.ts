import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { api, BASE_URL, DEMO, DEMO_PASSWORD, newProject, signUp, tokenFor, unique } from "./helpers";

/** Foundation: health, sessions, API tokens, projects, members and roles, through real HTTP. */

async function page(pathname: string, cookie?: string) {
  const res = await fetch(BASE_URL + pathname, { headers: cookie ? { Cookie: cookie } : {}, redirect: "manual" });
  return { status: res.status, location: res.headers.get("location"), text: await res.text() };
}

async function postForm(pathname: string, fields: Record<string, string>, cookie?: string) {
  const res = await fetch(BASE_URL + pathname, {
    method: "POST",
    body: new URLSearchParams(fields),
    headers: { "Content-Type": "application/x-www-form-urlencoded", ...(cookie ? { Cookie: cookie } : {}) },
    redirect: "manual",
  });
  return { status: res.status, location: res.headers.get("location"), cookie: res.headers.get("set-cookie"), text: await res.text() };
}

describe("health and errors", () => {
  it("reports the database as up", async () => {
    const res = await api("/healthz");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true, database: "up" });
  });

  it("answers unknown pages with the app's own 404 page", async () => {
    const res = await page("/no/such/page");
    expect(res.status).toBe(404);
    expect(res.text).toContain("Page not found");
    expect(res.text).not.toMatch(/at .*\.js:\d+/); // no stack trace
  });

  it("answers unknown API routes with JSON in the error shape", async () => {
    const res = await api("/api/v1/nothing-here");
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("not_found");
  });

  it("refuses malformed JSON with 400", async () => {
    const token = await tokenFor(DEMO.chemist);
    const res = await api("/api/v1/projects", { token, method: "POST", raw: "{not json", headers: { "Content-Type": "application/json" } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("bad_json");
  });
});

describe("sign-in", () => {
  it("gives a token for the right password and the same message for a wrong password and an unknown e-mail", async () => {
    const ok = await api("/api/v1/session", { body: { email: DEMO.chemist, password: DEMO_PASSWORD } });
    expect(ok.status).toBe(201);
    expect(ok.body.token).toMatch(/^tt_[A-Za-z0-9_-]{40,}$/);

    const wrong = await api("/api/v1/session", { body: { email: DEMO.chemist, password: "not the password" } });
    const unknown = await api("/api/v1/session", { body: { email: `${unique("nobody")}@demo.test`, password: "not the password" } });
    expect(wrong.status).toBe(422);
    expect(unknown.status).toBe(422);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it("signs in through the form, sets an httpOnly SameSite=Lax cookie and signs out", async () => {
    const res = await postForm("/sign-in?next=/projects", { email: DEMO.coauthor, password: DEMO_PASSWORD });
    expect(res.status).toBe(302);
    expect(res.location).toBe("/projects");
    expect(res.cookie).toMatch(/HttpOnly/i);
    expect(res.cookie).toMatch(/SameSite=Lax/i);
    const cookie = res.cookie!.split(";")[0];
    const projects = await page("/projects", cookie);
    expect(projects.status).toBe(200);
    const out = await postForm("/sign-out", {}, cookie);
    expect(out.status).toBe(302);
    expect(out.cookie).toMatch(/Max-Age=0|Expires=Thu, 01 Jan 1970/i);
  });

  it("does not follow a next= link to another site", async () => {
    const res = await postForm("/sign-in?next=//evil.example/", { email: DEMO.coauthor, password: DEMO_PASSWORD });
    expect(res.location).toBe("/projects");
  });

  it("shows field errors and stores nothing for a bad sign-up", async () => {
    const res = await postForm("/sign-up", { name: "", email: "not-an-email", password: "short", confirm: "other" });
    expect(res.status).toBe(422);
    expect(res.text).toContain("Enter your name");
    expect(res.text).toContain("Enter a valid e-mail address");
    expect(res.text).toContain("Use at least 10 characters");
  });

  it("limits sign-in attempts per e-mail", async () => {
    const email = `${unique("limited")}@demo.test`;
    await signUp(email, "a long enough password");
    let last = 0;
    for (let i = 0; i < 11; i++) {
      last = (await api("/api/v1/session", { body: { email, password: "wrong password" } })).status;
    }
    expect(last).toBe(429);
    // Even the right password waits until the window passes.
    const right = await api("/api/v1/session", { body: { email, password: "a long enough password" } });
    expect(right.status).toBe(429);
  });

  it("answers revoking someone else's or an unknown token on the tokens page with a message, not a server error", async () => {
    const token = await tokenFor(DEMO.chemist);
    const res = await fetch(`${BASE_URL}/settings/tokens`, {
      method: "POST",
      body: new URLSearchParams({ intent: "revoke", tokenId: "99999999" }),
      headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
      redirect: "manual",
    });
    expect(res.status).toBe(404);
    expect(await res.text()).toContain("No such token");
  });

  it("refuses a revoked or unknown bearer token", async () => {
    const res = await api("/api/v1/projects", { token: "tt_unknown" });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("unauthorized");
  });
});

describe("password reset by e-mail", () => {
  async function latestMailTo(address: string) {
    const dir = process.env.MAILBOX_DIR;
    if (!dir) throw new Error("MAILBOX_DIR is not set: run through npm test");
    for (let attempt = 0; attempt < 40; attempt++) {
      const names = (await readdir(dir)).filter((n) => n.endsWith(".json")).sort().reverse();
      for (const name of names) {
        const m = JSON.parse(await readFile(path.join(dir, name), "utf8"));
        if ((m.to as string[]).includes(address)) return m as { subject: string; text: string };
      }
      await new Promise((r) => setTimeout(r, 100));
    }
    throw new Error(`no mail to ${address}`);
  }

  it("sends a one-time link that sets a new password and ends older sessions", async () => {
    const email = `${unique("reset")}@demo.test`;
    const oldCookie = await signUp(email, "the first password");
    const asked = await postForm("/forgot-password", { email });
    expect(asked.status).toBe(200);
    const mail = await latestMailTo(email);
    expect(mail.subject).toContain("Reset");
    const link = /http:\/\/\S+\/reset-password\/\S+/.exec(mail.text)?.[0];
    expect(link).toBeTruthy();
    const resetPath = new URL(link!).pathname;

    const done = await postForm(resetPath, { password: "the second password", confirm: "the second password" });
    expect(done.status).toBe(302);
    expect((await api("/api/v1/session", { body: { email, password: "the second password" } })).status).toBe(201);
    expect((await api("/api/v1/session", { body: { email, password: "the first password" } })).status).toBe(422);

    // The link works once, and the session from before the change is no longer accepted.
    const again = await page(resetPath);
    expect(again.text).toContain("already been used");
    const oldSession = await page("/projects", oldCookie);
    expect(oldSession.status).toBe(302);
  });

  it("answers the same whether or not the e-mail has an account", async () => {
    const res = await postForm("/forgot-password", { email: `${unique("ghost")}@demo.test` });
    expect(res.status).toBe(200);
    expect(res.text).toContain("If an account uses that e-mail");
  });
});

describe("projects and roles", () => {
  it("creates a project through the API with its creator as owner, and validates the name", async () => {
    const token = await tokenFor(DEMO.chemist);
    const name = unique("Ligand screen");
    const res = await api("/api/v1/projects", { token, body: { name, description: "invented" } });
    expect(res.status).toBe(201);
    expect(res.body.project).toMatchObject({ name, role: "owner" });
    const list = await api("/api/v1/projects", { token });
    expect(list.body.projects.map((p: { name: string }) => p.name)).toContain(name);

    const bad = await api("/api/v1/projects", { token, body: { name: "" } });
    expect(bad.status).toBe(422);
    expect(bad.body.error.details[0]).toMatchObject({ field: "name" });
  });

  it("hides a project from non-members (404) and refuses a member without the right (403)", async () => {
    const { id } = await newProject(DEMO.chemist, [{ email: DEMO.coauthor, role: "viewer" }]);
    const outsider = await tokenFor(DEMO.supervisor);
    expect((await api(`/api/v1/projects/${id}`, { token: outsider })).status).toBe(404);
    const viewer = await tokenFor(DEMO.coauthor);
    expect((await api(`/api/v1/projects/${id}`, { token: viewer })).status).toBe(200);
    const rename = await api(`/api/v1/projects/${id}`, { token: viewer, method: "PATCH", body: { name: "taken over" } });
    expect(rename.status).toBe(403);
    const admin = await tokenFor(DEMO.admin);
    expect((await api(`/api/v1/projects/${id}`, { token: admin })).status).toBe(200);
  });

  it("lets the owner manage members but never remove the last owner", async () => {
    const { id, token } = await newProject(DEMO.chemist, [{ email: DEMO.supervisor, role: "auditor" }]);
    const members = await page(`/projects/${id}/members`, undefined);
    expect(members.status).toBe(302); // no session: sent to sign-in

    const res = await fetch(`${BASE_URL}/projects/${id}/members.data`, { headers: { Authorization: `Bearer ${token}` } });
    expect(res.status).toBe(200);

    // Removing the only owner is refused.
    const html = await (await fetch(`${BASE_URL}/projects/${id}/members`, { headers: { Authorization: `Bearer ${token}` } })).text();
    const ownerRow = /name="membershipId" value="(\d+)"/.exec(html);
    expect(ownerRow).toBeTruthy();
    const remove = await fetch(`${BASE_URL}/projects/${id}/members`, {
      method: "POST",
      headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ intent: "remove", membershipId: ownerRow![1] }),
    });
    expect(remove.status).toBe(409);
    expect(await remove.text()).toContain("last owner");

    // An auditor may not add members.
    const auditor = await tokenFor(DEMO.supervisor);
    const add = await fetch(`${BASE_URL}/projects/${id}/members`, {
      method: "POST",
      headers: { Authorization: `Bearer ${auditor}`, "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ intent: "add", email: DEMO.coauthor, role: "viewer" }),
    });
    expect(add.status).toBe(403);
  });

  it("records project changes in the history", async () => {
    const { id, token } = await newProject(DEMO.chemist);
    const renamed = await api(`/api/v1/projects/${id}`, { token, method: "PATCH", body: { name: "Renamed study", description: "d" } });
    expect(renamed.status).toBe(200);
    const html = await (await fetch(`${BASE_URL}/projects/${id}/history`, { headers: { Authorization: `Bearer ${token}` } })).text();
    expect(html).toContain("Created project");
    expect(html).toContain("Renamed or described project");
  });

  it("deletes a project for its owner only", async () => {
    const { id, token } = await newProject(DEMO.chemist, [{ email: DEMO.coauthor, role: "editor" }]);
    const editor = await tokenFor(DEMO.coauthor);
    expect((await api(`/api/v1/projects/${id}`, { token: editor, method: "DELETE" })).status).toBe(403);
    expect((await api(`/api/v1/projects/${id}`, { token, method: "DELETE" })).status).toBe(204);
    expect((await api(`/api/v1/projects/${id}`, { token })).status).toBe(404);
  });
});

describe("outbox and admin pages", () => {
  it("are for the site admin only", async () => {
    const chemist = await tokenFor(DEMO.chemist);
    const admin = await tokenFor(DEMO.admin);
    const asChemist = await fetch(`${BASE_URL}/admin/outbox`, { headers: { Authorization: `Bearer ${chemist}` } });
    expect(asChemist.status).toBe(404);
    const asAdmin = await fetch(`${BASE_URL}/admin/outbox`, { headers: { Authorization: `Bearer ${admin}` } });
    expect(asAdmin.status).toBe(200);
    expect(await asAdmin.text()).toContain("Outbox");
  });
});
