/**
 * Team work end to end over HTTP: invitations through the local mail fake, sign-off snapshots (their
 * checksum recomputed here, independently, and their immutability), the "changed since sign-off"
 * finding, share links, comments and accepted findings, and a permission matrix that sends every write
 * route the request of every role and of a share link.
 */
import { createHash } from "node:crypto";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { closeDb, db } from "../../db";
import { api, BASE_URL, DEMO, newProject, signUp, tokenFor, unique } from "./helpers";

const MAILBOX = process.env.MAILBOX_DIR;
const PASSWORD = "correct horse battery";

/** The newest message the SMTP fake stored for `to`, waiting for it to arrive. */
async function mailTo(to: string, timeoutMs = 10_000): Promise<{ subject: string; text: string }> {
  if (!MAILBOX) throw new Error("MAILBOX_DIR is not set: run through npm test");
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const names = (await readdir(MAILBOX).catch(() => [] as string[])).filter((n) => n.endsWith(".json")).sort().reverse();
    for (const name of names) {
      const m = JSON.parse(await readFile(path.join(MAILBOX, name), "utf8"));
      if ((m.to as string[]).includes(to)) return m;
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
}

const linkIn = (text: string) => {
  const m = /https?:\/\/\S+\/invitations\/\S+/.exec(text);
  if (!m) throw new Error(`no invitation link in: ${text}`);
  return new URL(m[0]).pathname;
};

async function form(pathname: string, fields: Record<string, string>, auth: { cookie?: string; token?: string } = {}) {
  const headers: Record<string, string> = { "Content-Type": "application/x-www-form-urlencoded" };
  if (auth.cookie) headers.Cookie = auth.cookie;
  if (auth.token) headers.Authorization = `Bearer ${auth.token}`;
  const res = await fetch(BASE_URL + pathname, { method: "POST", body: new URLSearchParams(fields), headers, redirect: "manual" });
  return { status: res.status, location: res.headers.get("location"), cookie: res.headers.get("set-cookie")?.split(";")[0] ?? null, text: await res.text() };
}

async function page(pathname: string, cookie?: string) {
  const res = await fetch(BASE_URL + pathname, { headers: cookie ? { Cookie: cookie } : {}, redirect: "manual" });
  return { status: res.status, text: await res.text() };
}

/**
 * Canonical JSON written here from its definition (sorted keys, no whitespace, JSON's own number and
 * string forms), not imported from the app, so the checksum is checked independently.
 */
function canonical(v: unknown): string {
  if (v === null || typeof v !== "object") return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(canonical).join(",")}]`;
  const keys = Object.keys(v as object).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`).join(",")}}`;
}
const sha256 = (s: string) => createHash("sha256").update(s, "utf8").digest("hex");

/** A small, invented, balanced ledger: 2 H2 + O2 -> 2 H2O through TS1, one protocol, one pathway. */
async function fillLedger(projectId: number, token: string) {
  const p = `/api/v1/projects/${projectId}`;
  const must = async (r: Promise<{ status: number; body: any }>) => {
    const res = await r;
    if (res.status >= 300) throw new Error(`setup failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body;
  };
  await must(api(`${p}/levels`, { token, body: { method: "B3LYP", basis: "def2-TZVP" } }));
  // Made-up energies of plausible size (hartree); the test checks bookkeeping, not chemistry.
  const species = [
    { label: "H2", formula: "H2", multiplicity: 1, energy: "-1.1795" },
    { label: "O2", formula: "O2", multiplicity: 3, energy: "-150.3711" },
    { label: "H2O", formula: "H2O", multiplicity: 1, energy: "-76.4646" },
  ];
  for (const s of species) {
    await must(api(`${p}/species`, { token, body: { label: s.label, formula: s.formula, multiplicity: s.multiplicity } }));
    await must(api(`${p}/calculations`, { token, body: { species: s.label, level: "B3LYP/def2-TZVP", electronicEnergy: s.energy } }));
  }
  await must(api(`${p}/protocols`, { token, body: { name: "main", energyLevel: "B3LYP/def2-TZVP" } }));
  const reaction = await must(api(`${p}/reactions`, { token, body: { equation: "2 H2 + O2 -> 2 H2O" } }));
  const pathway = await must(
    api(`${p}/pathways`, {
      token,
      body: {
        name: "water",
        states: [
          { label: "start", terms: [{ species: "H2", coefficient: 2 }, { species: "O2", coefficient: 1 }] },
          { label: "end", terms: [{ species: "H2O", coefficient: 2 }] },
        ],
      },
    }),
  );
  return { reactionId: reaction.reaction.id as number, pathwayId: pathway.pathway.id as number };
}

type Role = "owner" | "editor" | "auditor" | "viewer" | "outsider" | "anonymous" | "share";
const ROLES: Role[] = ["owner", "editor", "auditor", "viewer", "outsider", "anonymous", "share"];

let editorEmail: string;
let outsiderEmail: string;
let tokens: Record<"owner" | "editor" | "auditor" | "viewer" | "outsider", string>;

beforeAll(async () => {
  editorEmail = `${unique("editor")}@example.test`;
  outsiderEmail = `${unique("outsider")}@example.test`;
  await signUp(editorEmail, PASSWORD, "Edda Editor");
  await signUp(outsiderEmail, PASSWORD, "Otto Outsider");
  tokens = {
    owner: await tokenFor(DEMO.chemist),
    editor: await tokenFor(editorEmail, PASSWORD),
    auditor: await tokenFor(DEMO.supervisor),
    viewer: await tokenFor(DEMO.coauthor),
    outsider: await tokenFor(outsiderEmail, PASSWORD),
  };
});

afterAll(async () => {
  await closeDb();
});

const teamProject = () =>
  newProject(DEMO.chemist, [
    { email: DEMO.supervisor, role: "auditor" },
    { email: DEMO.coauthor, role: "viewer" },
    { email: editorEmail, role: "editor" },
  ]);

describe("invitations by e-mail", () => {
  test("a new person follows the e-mailed link, creates an account and lands in the project with the role", async () => {
    const { id, token } = await teamProject();
    const email = `${unique("invitee")}@example.test`;
    const created = await api(`/api/v1/projects/${id}/invitations`, { token, body: { email, role: "auditor" } });
    expect(created.status).toBe(201);
    expect(JSON.stringify(created.body)).not.toMatch(/invite_/); // the link travels by mail only

    const mail = await mailTo(email);
    expect(mail.subject).toMatch(/invites you/);
    const link = linkIn(mail.text);

    const before = await page(link);
    expect(before.status).toBe(200);
    expect(before.text).toContain('data-state="valid"');

    const joined = await form(link, { intent: "create", name: "Ines Invitee", password: PASSWORD, confirm: PASSWORD });
    expect(joined.status).toBe(302);
    expect(joined.location).toBe(`/projects/${id}`);
    expect(joined.cookie).toBeTruthy();

    const project = await api(`/api/v1/projects/${id}`, { headers: { Cookie: joined.cookie! } });
    expect(project.status).toBe(200);
    expect(project.body.project.role).toBe("auditor");

    // The link works once.
    const again = await page(link);
    expect(again.text).toContain('data-state="used"');
    const reuse = await form(link, { intent: "create", name: "Someone Else", password: PASSWORD, confirm: PASSWORD });
    expect(reuse.status).toBe(422);
    expect(reuse.text).toMatch(/already been used/);

    // History records the invitation and the new membership.
    const history = await api(`/api/v1/projects/${id}/history`, { token });
    const summaries = JSON.stringify(history.body);
    expect(summaries).toContain(`Invited ${email} as auditor`);
    expect(summaries).toContain(`${email} joined as auditor`);
  });

  test("a signed-in person accepts; expired and withdrawn links say so and are refused", async () => {
    const { id, token } = await teamProject();
    const email = `${unique("member")}@example.test`;
    const cookie = await signUp(email, PASSWORD, "Sam Signed");
    await api(`/api/v1/projects/${id}/invitations`, { token, body: { email, role: "viewer" } });
    const link = linkIn((await mailTo(email)).text);
    const accepted = await form(link, { intent: "accept" }, { cookie });
    expect(accepted.status).toBe(302);
    expect(accepted.location).toBe(`/projects/${id}`);
    expect((await api(`/api/v1/projects/${id}`, { headers: { Cookie: cookie } })).body.project.role).toBe("viewer");

    // Expired: the invitation's expiry moved into the past (as if a week had gone by).
    const late = `${unique("late")}@example.test`;
    await api(`/api/v1/projects/${id}/invitations`, { token, body: { email: late, role: "editor" } });
    const lateLink = linkIn((await mailTo(late)).text);
    await db().models.Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { projectId: id, email: late } });
    expect((await page(lateLink)).text).toContain('data-state="expired"');
    const lateTry = await form(lateLink, { intent: "create", name: "Late Person", password: PASSWORD, confirm: PASSWORD });
    expect(lateTry.status).toBe(422);
    expect(lateTry.text).toMatch(/expired/);

    // Withdrawn: listed as pending until the owner revokes it; then the link stops.
    const gone = `${unique("gone")}@example.test`;
    const inv = await api(`/api/v1/projects/${id}/invitations`, { token, body: { email: gone, role: "editor" } });
    const goneLink = linkIn((await mailTo(gone)).text);
    const pending = await api(`/api/v1/projects/${id}/invitations`, { token });
    expect(pending.body.invitations.map((i: { email: string }) => i.email)).toContain(gone);
    expect((await api(`/api/v1/projects/${id}/invitations/${inv.body.invitation.id}`, { token, method: "DELETE" })).status).toBe(200);
    expect((await page(goneLink)).text).toContain('data-state="revoked"');
    expect((await api(`/api/v1/projects/${id}/invitations`, { token })).body.invitations.map((i: { email: string }) => i.email)).not.toContain(gone);
    expect((await page("/invitations/invite_not-a-real-token")).text).toContain('data-state="unknown"');
  });
});

describe("sign-off and snapshots", () => {
  test("a snapshot's checksum is the SHA-256 of its content's canonical JSON, and no method changes it", async () => {
    const { id } = await teamProject();
    const { reactionId } = await fillLedger(id, tokens.owner);
    const signed = await api(`/api/v1/projects/${id}/snapshots`, { token: tokens.auditor, body: { statement: "Checked for the SI" } });
    expect(signed.status).toBe(201);
    const snapshotId = signed.body.snapshot.id as number;

    const got = await api(`/api/v1/projects/${id}/snapshots/${snapshotId}`, { token: tokens.viewer });
    expect(got.status).toBe(200);
    const snap = got.body.snapshot;
    expect(snap.checksum).toMatch(/^[0-9a-f]{64}$/);
    expect(sha256(canonical(snap.content))).toBe(snap.checksum);
    expect(snap.statement).toBe("Checked for the SI");
    expect(snap.signer.length).toBeGreaterThan(0);
    expect(snap.signedAt).toBe(signed.body.snapshot.signedAt);
    // Every input and the computed values under every protocol are frozen.
    for (const key of ["levels", "species", "calculations", "protocols", "reactions", "pathways"]) expect(snap.content.inputs[key].length).toBeGreaterThan(0);
    const protocolId = String(snap.content.inputs.protocols[0].id);
    expect(snap.content.computed[protocolId]["kcal/mol"].reactions.reactions[0].id).toBe(reactionId);
    expect(snap.content.computed[protocolId]["kJ/mol"].reactions.unit).toBe("kJ/mol");

    for (const method of ["PATCH", "PUT", "DELETE", "POST"]) {
      const r = await api(`/api/v1/projects/${id}/snapshots/${snapshotId}`, { token: tokens.owner, method, body: { statement: "rewritten" } });
      expect(r.status, method).toBe(405);
    }
    const page = await form(`/projects/${id}/snapshots/${snapshotId}`, { statement: "rewritten" }, { token: tokens.owner });
    expect(page.status).toBe(405);

    // An edit of the live project leaves the snapshot as it was.
    await api(`/api/v1/projects/${id}/species/H2`, { token: tokens.owner, method: "PATCH", body: { notes: "edited after sign-off" } });
    const after = await api(`/api/v1/projects/${id}/snapshots/${snapshotId}`, { token: tokens.owner });
    expect(after.body.snapshot.checksum).toBe(snap.checksum);
    expect(canonical(after.body.snapshot.content)).toBe(canonical(snap.content));
    expect(after.body.snapshot.content.inputs.species.find((s: { label: string }) => s.label === "H2").notes).toBe("");

    // The snapshot's workbook downloads; its cover names the snapshot and its checksum.
    const xlsx = await fetch(`${BASE_URL}/api/v1/projects/${id}/snapshots/${snapshotId}/export.xlsx`, { headers: { Authorization: `Bearer ${tokens.viewer}` } });
    expect(xlsx.status).toBe(200);
    const XLSX = await import("xlsx");
    const wb = XLSX.read(new Uint8Array(await xlsx.arrayBuffer()), { type: "array" });
    const cover = JSON.stringify(XLSX.utils.sheet_to_json(wb.Sheets[wb.SheetNames[0]!]!, { header: 1 }));
    expect(cover).toContain(`Snapshot #${snapshotId}`);
    expect(cover).toContain(snap.checksum);
  });

  test("an edit after sign-off raises the “changed since sign-off” warning and lists what changed", async () => {
    const { id } = await teamProject();
    await fillLedger(id, tokens.owner);
    const code = "changed_since_sign_off";
    expect((await api(`/api/v1/projects/${id}/snapshots`, { token: tokens.owner, body: {} })).status).toBe(201);
    const clean = await api(`/api/v1/projects/${id}/audit`, { token: tokens.viewer });
    expect(clean.body.findings.some((f: { code: string }) => f.code === code)).toBe(false);
    expect((await api(`/api/v1/projects/${id}/changes`, { token: tokens.viewer })).body.signOff.outdated).toBe(false);

    await api(`/api/v1/projects/${id}/species/H2`, { token: tokens.editor, method: "PATCH", body: { notes: "re-checked" } });
    await api(`/api/v1/projects/${id}/species`, { token: tokens.editor, body: { label: "H2O2", formula: "H2O2" } });

    const audit = await api(`/api/v1/projects/${id}/audit`, { token: tokens.viewer });
    const finding = audit.body.findings.find((f: { code: string }) => f.code === code);
    expect(finding).toBeTruthy();
    expect(finding.severity).toBe("warning");
    const changes = (await api(`/api/v1/projects/${id}/changes`, { token: tokens.viewer })).body.signOff;
    expect(changes.outdated).toBe(true);
    expect(changes.changes).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ collection: "species", label: "H2", change: "changed", fields: [{ field: "notes", before: "", after: "re-checked" }] }),
        expect.objectContaining({ collection: "species", label: "H2O2", change: "added" }),
      ]),
    );
    // No computed value moved yet (a note and a new species change no reaction).
    expect(changes.valueChanges).toEqual([]);
    // A changed energy shows as the reaction value it moved: 2 H2 + O2 -> 2 H2O at -76.4646 and then
    // -76.4656 hartree for H2O (the invented energies above), ΔE = Σν·E, 1 hartree = 627.509 474 kcal/mol
    // (CODATA 2018: 4.359 744 722 2071e-18 J × 6.022 140 76e23 / 4184).
    const grid = await api(`/api/v1/projects/${id}/calculations/grid`, { token: tokens.editor, body: { cells: [{ species: "H2O", level: "B3LYP/def2-TZVP", electronicEnergy: "-76.4656" }] } });
    expect(grid.status).toBe(200);
    const moved = (await api(`/api/v1/projects/${id}/changes`, { token: tokens.viewer })).body.signOff;
    expect(moved.valueUnit).toBe("kcal/mol");
    const dE = moved.valueChanges.find((v: { quantity: string }) => v.quantity === "deltaE");
    expect(dE.reaction).toBe("2 H2 + O2 -> 2 H2O");
    const KCAL_PER_HARTREE = 627.5094740631;
    expect(dE.before).toBeCloseTo((2 * -76.4646 - (2 * -1.1795 + -150.3711)) * KCAL_PER_HARTREE, 6);
    expect(dE.after).toBeCloseTo((2 * -76.4656 - (2 * -1.1795 + -150.3711)) * KCAL_PER_HARTREE, 6);
    // The project pages carry the banner.
    const overview = await fetch(`${BASE_URL}/projects/${id}`, { headers: { Authorization: `Bearer ${tokens.viewer}` } });
    const overviewHtml = await overview.text();
    expect(overviewHtml).toContain('data-outdated="1"');
    expect(overviewHtml).toContain('data-testid="values-since-sign-off"');

    // A new sign-off covers the edits again.
    await api(`/api/v1/projects/${id}/snapshots`, { token: tokens.auditor, body: {} });
    const again = await api(`/api/v1/projects/${id}/audit`, { token: tokens.viewer });
    expect(again.body.findings.some((f: { code: string }) => f.code === code)).toBe(false);
  });
});

describe("comments and accepted findings", () => {
  test("members other than viewers comment; an auditor accepts a finding with a reason, recorded in the history", async () => {
    const { id } = await teamProject();
    const { reactionId } = await fillLedger(id, tokens.owner);
    const c = await api(`/api/v1/projects/${id}/comments`, { token: tokens.editor, body: { targetType: "reaction", targetKey: reactionId, body: "Check the O2 spin state" } });
    expect(c.status).toBe(201);
    expect((await api(`/api/v1/projects/${id}/comments`, { token: tokens.viewer, body: { targetType: "reaction", targetKey: reactionId, body: "x" } })).status).toBe(403);
    const bad = await api(`/api/v1/projects/${id}/comments`, { token: tokens.editor, body: { targetType: "reaction", targetKey: 999999, body: "x" } });
    expect(bad.status).toBe(422);

    const key = `final_double_zeta:level:1`;
    expect((await api(`/api/v1/projects/${id}/findings/accept`, { token: tokens.editor, body: { findingKey: key, reason: "x" } })).status).toBe(403);
    const noReason = await api(`/api/v1/projects/${id}/findings/accept`, { token: tokens.auditor, body: { findingKey: key, reason: " " } });
    expect(noReason.status).toBe(422);
    expect(noReason.body.error.details[0].field).toBe("reason");
    const ok = await api(`/api/v1/projects/${id}/findings/accept`, { token: tokens.auditor, body: { findingKey: key, reason: "Screening level only" } });
    expect(ok.status).toBe(201);
    const list = await api(`/api/v1/projects/${id}/comments?targetType=reaction&targetKey=${reactionId}`, { token: tokens.viewer });
    expect(list.body.comments.map((x: { body: string }) => x.body)).toEqual(["Check the O2 spin state"]);
    expect(list.body.acceptances.map((a: { findingKey: string }) => a.findingKey)).toContain(key);
    const history = JSON.stringify((await api(`/api/v1/projects/${id}/history`, { token: tokens.owner })).body);
    expect(history).toContain("Accepted finding final_double_zeta:level:1: Screening level only");
    expect((await api(`/api/v1/projects/${id}/findings/accept`, { token: tokens.auditor, method: "DELETE", body: { findingKey: key } })).status).toBe(204);
  });
});

describe("share links", () => {
  test("a link shows the project read-only without sign-in; revoked or expired it stops at once", async () => {
    const { id } = await teamProject();
    const { pathwayId } = await fillLedger(id, tokens.owner);
    const created = await api(`/api/v1/projects/${id}/share-links`, { token: tokens.owner, body: { label: "coauthors" } });
    expect(created.status).toBe(201);
    const { token, url, id: linkId } = created.body.shareLink;
    expect(token.length).toBeGreaterThanOrEqual(40);
    const base = new URL(url).pathname;
    for (const sub of ["", "/ledger?unit=kJ%2Fmol", `/pathways/${pathwayId}`, "/audit"]) {
      const r = await page(base + sub);
      expect(r.status, sub).toBe(200);
      expect(r.text).toContain('data-share-view="1"');
    }
    const xlsx = await fetch(`${BASE_URL}${base}/export.xlsx`);
    expect(xlsx.status).toBe(200);
    expect(xlsx.headers.get("content-type")).toMatch(/spreadsheetml/);
    // Stored hashed: the token itself is nowhere in the table.
    const row = await db().models.ShareLink.findByPk(linkId);
    expect(row!.tokenHash).toBe(sha256(token));
    expect(JSON.stringify(row!.get({ plain: true }))).not.toContain(token);
    const listed = await api(`/api/v1/projects/${id}/share-links`, { token: tokens.owner });
    expect(listed.body.shareLinks[0].lastUsedAt).not.toBeNull();

    expect((await fetch(BASE_URL + base, { method: "POST", body: new URLSearchParams({ x: "1" }) })).status).toBe(405);
    expect((await api(`/api/v1/projects/${id}/share-links/${linkId}`, { token: tokens.owner, method: "DELETE" })).status).toBe(200);
    expect((await page(base)).status).toBe(404);
    expect((await fetch(`${BASE_URL}${base}/export.xlsx`)).status).toBe(404);

    const expiring = await api(`/api/v1/projects/${id}/share-links`, { token: tokens.owner, body: { label: "briefly", expiresAt: "2099-01-01" } });
    const expBase = new URL(expiring.body.shareLink.url).pathname;
    expect((await page(expBase)).status).toBe(200);
    await db().models.ShareLink.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: expiring.body.shareLink.id } });
    expect((await page(expBase)).status).toBe(404);
  });

  test("a link to a snapshot shows its frozen values, not the live ones", async () => {
    const { id } = await teamProject();
    await fillLedger(id, tokens.owner);
    const snap = await api(`/api/v1/projects/${id}/snapshots`, { token: tokens.owner, body: {} });
    const link = await api(`/api/v1/projects/${id}/share-links`, { token: tokens.owner, body: { label: "SI", snapshotId: snap.body.snapshot.id } });
    await api(`/api/v1/projects/${id}/reactions`, { token: tokens.owner, body: { equation: "H2O -> H2O" } });
    const base = new URL(link.body.shareLink.url).pathname;
    const overview = await page(base);
    expect(overview.text).toMatch(new RegExp(`snapshot #(<!-- -->)?${snap.body.snapshot.id}\\b`));
    expect(overview.text).toMatch(/data-testid="count-reactions"[^>]*>1</);
  });
});

// ------------------------------------------------------------------ permission matrix
type Ctx = { projectId: number; reactionId: number; pathwayId: number; shareToken: string; snapshotId: number };
/** A request: a JSON (or, for pages, form) body, or one file sent as multipart/form-data in the field "file". */
type Setup = { path: string; body?: unknown; file?: { name: string; text: string; type?: string } };
type Entry = {
  method: string;
  route: string; // as in app/routes.ts, under /api/v1
  needs: "user" | "read" | "edit" | "review" | "comment" | "manage" | "public";
  /** Request for a role that may: path and body (a fresh object where the request consumes it). */
  request: (ctx: Ctx, n: number) => Promise<Setup> | Setup;
  /**
   * Expected answer when allowed: the exact status (and, for a redirect, where it points); without it,
   * any 2xx. "any" where the object asked for may not exist (any answer but 401/403).
   */
  allowed?: { status: number; location?: RegExp } | "any";
};

const P = (ctx: Ctx) => `/api/v1/projects/${ctx.projectId}`;
/** A valid calculator request: water, fundamentals and geometry from memory (NIST CCCBDB); only the answer's status is checked here. */
const CALCULATOR_BODY = {
  frequencies: [1594.6, 3657.1, 3755.8],
  geometry: { format: "xyz", data: "3\nwater\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692\n" },
  symmetryNumber: 2,
};
/** A new account that belongs to no project yet (for adding members through the page). */
const freshUser = async () => {
  const email = `${unique("joiner")}@example.test`;
  await signUp(email, PASSWORD, "Jo Joiner");
  return email;
};
const ownerApi = (path: string, body: unknown) => api(path, { token: tokens.owner, body });
const fresh = async (ctx: Ctx, kind: string, n: number): Promise<number | string> => {
  const label = `${kind}-${n}-${Date.now().toString(36)}`;
  switch (kind) {
    case "species":
      return (await ownerApi(`${P(ctx)}/species`, { label, formula: "H2" })).body.species.id as number;
    case "level":
      return (await ownerApi(`${P(ctx)}/levels`, { method: "PBE0", basis: ["def2-SVP", "cc-pVDZ", "cc-pVTZ", "6-31G*", "def2-QZVP", "aug-cc-pVDZ", "6-311G**", "cc-pVQZ"][n % 8] })).body.level.id as number;
    case "calculation":
      return (await ownerApi(`${P(ctx)}/calculations`, { species: "H2O", level: "B3LYP/def2-TZVP", electronicEnergy: "-76.4646" })).body.calculation.id as number;
    case "protocol":
      return (await ownerApi(`${P(ctx)}/protocols`, { name: label, energyLevel: "B3LYP/def2-TZVP" })).body.protocol.id as number;
    case "reaction":
      return (await ownerApi(`${P(ctx)}/reactions`, { equation: "2 H2 + O2 -> 2 H2O" })).body.reaction.id as number;
    case "pathway":
      return (await ownerApi(`${P(ctx)}/pathways`, { name: label, states: [{ label: "a", terms: [{ species: "H2O", coefficient: 1 }] }, { label: "b", terms: [{ species: "H2O", coefficient: 1 }] }] })).body.pathway.id as number;
    case "invitation":
      return (await ownerApi(`${P(ctx)}/invitations`, { email: `${label}@example.test`, role: "viewer" })).body.invitation.id as number;
    case "share-link":
      return (await ownerApi(`${P(ctx)}/share-links`, { label })).body.shareLink.id as number;
    case "conformer": {
      const sid: number | string = await fresh(ctx, "species", n);
      const c = await ownerApi(`${P(ctx)}/species/${sid}/conformers`, { label: "c1", geometry: "2\nH2\nH 0 0 0\nH 0 0 0.74\n" });
      return `${sid}/conformers/${c.body.conformer.id}`;
    }
    default:
      throw new Error(kind);
  }
};

/** Every write route under /api/v1 (and each read-only one, listed with method "GET"). */
const API_ROUTES: Entry[] = [
  { method: "POST", route: "session", needs: "public", request: () => ({ path: "/api/v1/session", body: { email: DEMO.coauthor, password: "thermotally-demo" } }) },
  { method: "POST", route: "thermo", needs: "user", allowed: { status: 200 }, request: () => ({ path: "/api/v1/thermo", body: CALCULATOR_BODY }) },
  { method: "POST", route: "projects", needs: "user", allowed: { status: 201 }, request: () => ({ path: "/api/v1/projects", body: { name: unique("matrix") } }) },
  { method: "PATCH", route: "projects/:projectId", needs: "manage", request: (c) => ({ path: P(c), body: { name: unique("renamed") } }) },
  {
    method: "DELETE",
    route: "projects/:projectId",
    needs: "manage",
    request: async () => ({ path: `/api/v1/projects/${(await teamProject()).id}` }),
  },
  { method: "POST", route: "projects/:projectId/levels", allowed: { status: 201 }, needs: "edit", request: (c, n) => ({ path: `${P(c)}/levels`, body: { method: "TPSS", basis: ["def2-SVP", "def2-TZVP", "cc-pVTZ", "6-31G*", "def2-QZVP", "aug-cc-pVDZ", "6-311G**"][n % 7] } }) },
  { method: "PATCH", route: "projects/:projectId/levels/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/levels/${await fresh(c, "level", n)}`, body: { method: "PBE0", basis: ["def2-SVP", "cc-pVDZ", "cc-pVTZ", "6-31G*", "def2-QZVP", "aug-cc-pVDZ", "6-311G**", "cc-pVQZ"][n % 8], dispersion: "D3(BJ)" } }) },
  { method: "DELETE", route: "projects/:projectId/levels/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/levels/${await fresh(c, "level", n + 4)}` }) },
  { method: "POST", route: "projects/:projectId/species", allowed: { status: 201 }, needs: "edit", request: (c) => ({ path: `${P(c)}/species`, body: { label: unique("S"), formula: "CH4" } }) },
  { method: "PATCH", route: "projects/:projectId/species/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/species/${await fresh(c, "species", n)}`, body: { notes: "matrix" } }) },
  { method: "DELETE", route: "projects/:projectId/species/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/species/${await fresh(c, "species", n)}` }) },
  { method: "POST", route: "projects/:projectId/species/:itemId/conformers", allowed: { status: 201 }, needs: "edit", request: async (c, n) => ({ path: `${P(c)}/species/${await fresh(c, "species", n)}/conformers`, body: { label: "c1", geometry: "2\nH2\nH 0 0 0\nH 0 0 0.74\n" } }) },
  { method: "PATCH", route: "projects/:projectId/species/:itemId/conformers/:conformerId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/species/${await fresh(c, "conformer", n)}`, body: { label: "c1b" } }) },
  { method: "DELETE", route: "projects/:projectId/species/:itemId/conformers/:conformerId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/species/${await fresh(c, "conformer", n)}` }) },
  { method: "POST", route: "projects/:projectId/calculations", allowed: { status: 201 }, needs: "edit", request: (c) => ({ path: `${P(c)}/calculations`, body: { species: "H2", level: "B3LYP/def2-TZVP", electronicEnergy: "-1.1795" } }) },
  { method: "POST", route: "projects/:projectId/calculations/grid", needs: "edit", allowed: { status: 200 }, request: (c, n) => ({ path: `${P(c)}/calculations/grid`, body: { cells: [{ species: "H2", level: "B3LYP/def2-TZVP", electronicEnergy: `-1.17950${n}` }] } }) },
  { method: "PATCH", route: "projects/:projectId/calculations/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/calculations/${await fresh(c, "calculation", n)}`, body: { converged: true } }) },
  { method: "DELETE", route: "projects/:projectId/calculations/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/calculations/${await fresh(c, "calculation", n)}` }) },
  { method: "POST", route: "projects/:projectId/protocols", allowed: { status: 201 }, needs: "edit", request: (c) => ({ path: `${P(c)}/protocols`, body: { name: unique("proto"), energyLevel: "B3LYP/def2-TZVP" } }) },
  { method: "PATCH", route: "projects/:projectId/protocols/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/protocols/${await fresh(c, "protocol", n)}`, body: { temperature: 310 } }) },
  { method: "DELETE", route: "projects/:projectId/protocols/:itemId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/protocols/${await fresh(c, "protocol", n)}` }) },
  { method: "GET", route: "projects/:projectId/history", needs: "read", request: (c) => ({ path: `${P(c)}/history` }) },
  { method: "POST", route: "projects/:projectId/invitations", allowed: { status: 201 }, needs: "manage", request: (c) => ({ path: `${P(c)}/invitations`, body: { email: `${unique("m")}@example.test`, role: "viewer" } }) },
  { method: "DELETE", route: "projects/:projectId/invitations/:invitationId", needs: "manage", request: async (c, n) => ({ path: `${P(c)}/invitations/${await fresh(c, "invitation", n)}` }) },
  { method: "POST", route: "projects/:projectId/share-links", allowed: { status: 201 }, needs: "manage", request: (c) => ({ path: `${P(c)}/share-links`, body: { label: "matrix" } }) },
  { method: "DELETE", route: "projects/:projectId/share-links/:shareLinkId", needs: "manage", request: async (c, n) => ({ path: `${P(c)}/share-links/${await fresh(c, "share-link", n)}` }) },
  { method: "POST", route: "projects/:projectId/snapshots", allowed: { status: 201 }, needs: "review", request: (c) => ({ path: `${P(c)}/snapshots`, body: { statement: "matrix" } }) },
  { method: "GET", route: "projects/:projectId/snapshots/:snapshotId", needs: "read", request: (c) => ({ path: `${P(c)}/snapshots/${c.snapshotId}` }) },
  { method: "GET", route: "projects/:projectId/snapshots/:snapshotId/export.xlsx", needs: "read", request: (c) => ({ path: `${P(c)}/snapshots/${c.snapshotId}/export.xlsx` }) },
  { method: "GET", route: "projects/:projectId/changes", needs: "read", request: (c) => ({ path: `${P(c)}/changes` }) },
  { method: "POST", route: "projects/:projectId/comments", allowed: { status: 201 }, needs: "comment", request: (c) => ({ path: `${P(c)}/comments`, body: { targetType: "reaction", targetKey: c.reactionId, body: "matrix" } }) },
  { method: "POST", route: "projects/:projectId/findings/accept", allowed: { status: 201 }, needs: "review", request: (c) => ({ path: `${P(c)}/findings/accept`, body: { findingKey: "matrix:reaction:1", reason: "matrix" } }) },
  { method: "POST", route: "projects/:projectId/reactions", allowed: { status: 201 }, needs: "edit", request: (c) => ({ path: `${P(c)}/reactions`, body: { equation: "2 H2 + O2 -> 2 H2O" } }) },
  { method: "PATCH", route: "projects/:projectId/reactions/:reactionId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/reactions/${await fresh(c, "reaction", n)}`, body: { notes: "matrix" } }) },
  { method: "DELETE", route: "projects/:projectId/reactions/:reactionId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/reactions/${await fresh(c, "reaction", n)}` }) },
  { method: "GET", route: "projects/:projectId/reactions/:reactionId/breakdown", needs: "read", request: (c) => ({ path: `${P(c)}/reactions/${c.reactionId}/breakdown` }) },
  { method: "POST", route: "projects/:projectId/pathways", allowed: { status: 201 }, needs: "edit", request: (c) => ({ path: `${P(c)}/pathways`, body: { name: unique("pw"), states: [{ label: "a", terms: [{ species: "H2O", coefficient: 1 }] }, { label: "b", terms: [{ species: "H2O", coefficient: 1 }] }] } }) },
  { method: "PATCH", route: "projects/:projectId/pathways/:pathwayId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/pathways/${await fresh(c, "pathway", n)}`, body: { name: unique("pw2") } }) },
  { method: "DELETE", route: "projects/:projectId/pathways/:pathwayId", needs: "edit", request: async (c, n) => ({ path: `${P(c)}/pathways/${await fresh(c, "pathway", n)}` }) },
  { method: "GET", route: "projects/:projectId/audit", needs: "read", request: (c) => ({ path: `${P(c)}/audit` }) },
  { method: "POST", route: "projects/:projectId/imports", needs: "edit", allowed: { status: 201 }, request: (c) => ({ path: `${P(c)}/imports`, file: { name: "matrix.csv", type: "text/csv", text: `Species,Formula,Level,Electronic energy (hartree)\n${unique("imp")},H2,B3LYP/def2-TZVP,-1.1795\n` } }) },
  { method: "GET", route: "projects/:projectId/imports/:template", needs: "read", allowed: "any", request: (c) => ({ path: `${P(c)}/imports/template.csv` }) },
  { method: "POST", route: "projects/:projectId/calculations/:calculationId/files", needs: "edit", allowed: { status: 201 }, request: async (c, n) => ({ path: `${P(c)}/calculations/${await fresh(c, "calculation", n)}/files`, file: { name: "freq.out", text: `an output file kept untouched as provenance (${n})\n` } }) },
  { method: "GET", route: "projects/:projectId/files", needs: "read", request: (c) => ({ path: `${P(c)}/files` }) },
  { method: "GET", route: "projects/:projectId/files/:fileId", needs: "read", allowed: "any", request: (c) => ({ path: `${P(c)}/files/999999` }) },
  { method: "GET", route: "projects/:projectId/export.xlsx", needs: "read", request: (c) => ({ path: `${P(c)}/export.xlsx` }) },
  { method: "GET", route: "projects/:projectId/export.csv", needs: "read", request: (c) => ({ path: `${P(c)}/export.csv` }) },
];

/** Page actions (form posts): the same rules hold for pages; the anonymous and share links are sent to sign in. */
const PAGE_ACTIONS: Entry[] = [
  { method: "POST", route: "/projects/:projectId/members", needs: "manage", request: (c) => ({ path: `/projects/${c.projectId}/members`, body: { intent: "invite", email: `${unique("p")}@example.test`, role: "viewer" } }) },
  { method: "POST", route: "/projects/:projectId/members#add", needs: "manage", request: async (c) => ({ path: `/projects/${c.projectId}/members`, body: { intent: "add", email: await freshUser(), role: "viewer" } }) },
  { method: "POST", route: "/projects/:projectId/members#revoke-invitation", needs: "manage", request: async (c, n) => ({ path: `/projects/${c.projectId}/members`, body: { intent: "revoke-invitation", invitationId: String(await fresh(c, "invitation", n)) } }) },
  { method: "POST", route: "/projects/:projectId/members#create-share-link", needs: "manage", request: (c) => ({ path: `/projects/${c.projectId}/members`, body: { intent: "create-share-link", label: "page", snapshotId: String(c.snapshotId), expiresAt: "2099-12-31" } }) },
  { method: "POST", route: "/projects/:projectId/members#revoke-share-link", needs: "manage", request: async (c, n) => ({ path: `/projects/${c.projectId}/members`, body: { intent: "revoke-share-link", shareLinkId: String(await fresh(c, "share-link", n)) } }) },
  { method: "POST", route: "/projects/:projectId/settings", needs: "manage", request: (c) => ({ path: `/projects/${c.projectId}/settings`, body: { name: unique("renamed"), description: "" } }) },
  {
    method: "POST",
    route: "/projects/:projectId/settings#delete",
    needs: "manage",
    allowed: { status: 302, location: /^\/projects$/ },
    request: async () => {
      const { id } = await teamProject();
      const name = (await api(`/api/v1/projects/${id}`, { token: tokens.owner })).body.project.name as string;
      return { path: `/projects/${id}/settings`, body: { intent: "delete", confirmName: name } };
    },
  },
  { method: "POST", route: "/projects/:projectId/snapshots", needs: "review", request: (c) => ({ path: `/projects/${c.projectId}/snapshots`, body: { statement: "page" } }) },
  { method: "POST", route: "/projects/:projectId/levels", needs: "edit", request: (c, n) => ({ path: `/projects/${c.projectId}/levels`, body: { method: "M06-2X", basis: ["def2-SVP", "def2-TZVP", "cc-pVTZ", "6-31G*", "def2-QZVP", "aug-cc-pVDZ", "6-311G**"][n % 7]! } }) },
  { method: "POST", route: "/projects/:projectId/species", needs: "edit", request: (c) => ({ path: `/projects/${c.projectId}/species`, body: { label: unique("page"), formula: "CH4" } }) },
  { method: "POST", route: "/projects/:projectId/species/:speciesId", needs: "edit", request: async (c, n) => ({ path: `/projects/${c.projectId}/species/${await fresh(c, "species", n)}`, body: { intent: "add-conformer", label: "c1", geometry: "2\nH2\nH 0 0 0\nH 0 0 0.74\n" } }) },
  { method: "POST", route: "/projects/:projectId/protocols", needs: "edit", request: (c) => ({ path: `/projects/${c.projectId}/protocols`, body: { intent: "create", name: unique("page"), energyLevel: "B3LYP/def2-TZVP", thermalLevel: "", thermalSource: "computed", temperature: "298.15", standardState: "1 atm", lowFrequencyTreatment: "none", lowFrequencyCutoff: "100", frequencyScale: "1", conformerTreatment: "lowest" } }) },
  { method: "POST", route: "/projects/:projectId/protocols#default", needs: "edit", request: async (c, n) => ({ path: `/projects/${c.projectId}/protocols`, body: { intent: "default", protocolId: String(await fresh(c, "protocol", n)) } }) },
  {
    method: "POST",
    route: "/projects/:projectId/pathways",
    needs: "edit",
    allowed: { status: 302, location: /^\/projects\/\d+\/pathways\/\d+$/ },
    request: (c) => ({ path: `/projects/${c.projectId}/pathways`, body: { name: unique("page"), states: "a: H2O\nb: H2O" } }),
  },
];

const mayDo: Record<Entry["needs"], Role[]> = {
  public: ROLES,
  user: ["owner", "editor", "auditor", "viewer", "outsider"],
  read: ["owner", "editor", "auditor", "viewer"],
  edit: ["owner", "editor"],
  review: ["owner", "auditor"],
  comment: ["owner", "editor", "auditor"],
  manage: ["owner"],
};

type Want = { status: number | "2xx" | "any"; location?: RegExp };

function expected(entry: Entry, role: Role, page: boolean): Want {
  if (mayDo[entry.needs].includes(role)) {
    if (entry.allowed === "any") return { status: "any" };
    return entry.allowed ?? { status: "2xx" };
  }
  // A share token is no API token: to the API it is no credential (401), and pages send it to sign in.
  if (role === "anonymous" || role === "share") return page ? { status: 302, location: /^\/sign-in\b/ } : { status: 401 };
  if (entry.needs === "user") return { status: 401 };
  if (role === "outsider") return { status: 404 };
  return { status: 403 };
}

function answers(want: Want, got: { status: number; location: string | null }): boolean {
  if (want.status === "any") return got.status < 500 && ![401, 403].includes(got.status);
  if (want.status === "2xx") return got.status >= 200 && got.status < 300;
  if (got.status !== want.status) return false;
  return !want.location || want.location.test(got.location ?? "");
}

async function send(entry: Entry, role: Role, setup: Setup, page: boolean, ctx: Ctx) {
  const headers: Record<string, string> = {};
  if (role === "share") headers.Authorization = `Bearer ${ctx.shareToken}`;
  else if (role !== "anonymous") headers.Authorization = `Bearer ${tokens[role]}`;
  let body: BodyInit | undefined;
  if (setup.file) {
    const fd = new FormData();
    fd.append("file", new Blob([setup.file.text], { type: setup.file.type ?? "application/octet-stream" }), setup.file.name);
    body = fd;
  } else if (setup.body !== undefined) {
    if (page) {
      headers["Content-Type"] = "application/x-www-form-urlencoded";
      body = new URLSearchParams(setup.body as Record<string, string>);
    } else {
      headers["Content-Type"] = "application/json";
      body = JSON.stringify(setup.body);
    }
  }
  const res = await fetch(BASE_URL + setup.path, { method: entry.method, headers, body, redirect: "manual" });
  const text = await res.text();
  return { status: res.status, location: res.headers.get("location"), text };
}

describe("permission matrix", () => {
  let ctx: Ctx;

  beforeAll(async () => {
    const { id } = await teamProject();
    const { reactionId, pathwayId } = await fillLedger(id, tokens.owner);
    const snap = await api(`/api/v1/projects/${id}/snapshots`, { token: tokens.owner, body: {} });
    const share = await api(`/api/v1/projects/${id}/share-links`, { token: tokens.owner, body: { label: "matrix" } });
    ctx = { projectId: id, reactionId, pathwayId, snapshotId: snap.body.snapshot.id, shareToken: share.body.shareLink.token };
  });

  test("the list names every route of app/routes.ts under /api/v1", async () => {
    const source = await readFile(path.resolve(import.meta.dirname, "../../app/routes.ts"), "utf8");
    const block = source.slice(source.indexOf('prefix("api/v1"'));
    const declared = [...block.matchAll(/route\("([^"]+)",\s*"routes\/api\//g)].map((m) => m[1]!).filter((r) => r !== "*");
    const listed = new Set(API_ROUTES.map((e) => e.route));
    const missing = declared.filter((r) => !listed.has(r));
    expect(missing, "routes under /api/v1 not in the permission matrix").toEqual([]);
    expect(declared.length).toBeGreaterThan(20);
  });

  const cases = [...API_ROUTES.map((e) => ({ e, page: false })), ...PAGE_ACTIONS.map((e) => ({ e, page: true }))];
  for (const { e, page } of cases) {
    test(`${e.method} ${page ? e.route : `/api/v1/${e.route}`}: each role gets its answer`, async () => {
      const seen: string[] = [];
      const wrong: string[] = [];
      let n = 0;
      for (const role of ROLES) {
        const want = expected(e, role, page);
        const setup = await e.request(ctx, n++);
        const got = await send(e, role, setup, page, ctx);
        seen.push(`${role}:${got.status}`);
        if (!answers(want, got)) {
          const wanted = `${want.status}${want.location ? ` to ${want.location}` : ""}`;
          wrong.push(`${role} got ${got.status}${got.location ? ` to ${got.location}` : ""}, expected ${wanted}: ${got.text.slice(0, 200)}`);
        }
      }
      expect(wrong, seen.join(" ")).toEqual([]);
    });
  }

  test("the page list names every project page that takes a form post", async () => {
    const source = await readFile(path.resolve(import.meta.dirname, "../../app/routes.ts"), "utf8");
    const layout = 'route("projects/:projectId", "routes/project-layout.tsx"';
    const block = source.slice(source.indexOf(layout) + layout.length, source.indexOf('route("settings/tokens"'));
    const withAction: string[] = [];
    for (const m of block.matchAll(/(?:route\("([^"]+)",|index\()\s*"(routes\/[^"]+)"/g)) {
      const file = await readFile(path.resolve(import.meta.dirname, "../../app", m[2]!), "utf8");
      if (/export (async function|const) action\b/.test(file)) withAction.push(`/projects/:projectId${m[1] ? `/${m[1]}` : ""}`);
    }
    const listed = new Set(PAGE_ACTIONS.map((e) => e.route.split("#")[0]));
    expect(withAction.filter((r) => !listed.has(r)), "project pages with an action not in the permission matrix").toEqual([]);
    expect(withAction.length).toBeGreaterThan(5);
  });

  test("no route under /share accepts a write", async () => {
    for (const sub of ["", "/ledger", `/pathways/${ctx.pathwayId}`, "/audit", "/export.xlsx"]) {
      for (const method of ["POST", "PUT", "PATCH", "DELETE"]) {
        const res = await fetch(`${BASE_URL}/share/${ctx.shareToken}${sub}`, { method, body: method === "DELETE" ? undefined : "x=1", headers: { "Content-Type": "application/x-www-form-urlencoded" }, redirect: "manual" });
        expect([403, 405], `${method} /share/…${sub} answered ${res.status}`).toContain(res.status);
      }
    }
  });
});
