/**
 * In Chromium: an owner invites by e-mail from the members page and the invitee follows the e-mailed
 * link in a browser of their own; an owner creates a share link and a fresh browser (no sign-in) finds
 * the shared project read-only.
 */
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { BASE_URL, DEMO, DEMO_PASSWORD, launchBrowser, open, screenshot, signIn, type TestBrowser } from "./harness";

const MAILBOX = process.env.MAILBOX_DIR;

async function invitationLinkFor(to: string): Promise<string> {
  if (!MAILBOX) throw new Error("MAILBOX_DIR is not set: run through npm test");
  const deadline = Date.now() + 10_000;
  while (Date.now() < deadline) {
    const names = (await readdir(MAILBOX).catch(() => [] as string[])).filter((n) => n.endsWith(".json")).sort().reverse();
    for (const name of names) {
      const m = JSON.parse(await readFile(path.join(MAILBOX, name), "utf8"));
      const link = /https?:\/\/\S+\/invitations\/\S+/.exec(m.text ?? "");
      if ((m.to as string[]).includes(to) && link) return link[0];
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`no invitation mail to ${to}`);
}

async function newProjectAsChemist(): Promise<number> {
  const session = await fetch(`${BASE_URL}/api/v1/session`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ email: DEMO.chemist, password: DEMO_PASSWORD }),
  });
  const { token } = await session.json();
  const res = await fetch(`${BASE_URL}/api/v1/projects`, {
    method: "POST",
    headers: { "Content-Type": "application/json", Authorization: `Bearer ${token}` },
    body: JSON.stringify({ name: `Team e2e ${Date.now().toString(36)}`, description: "Invented study for the team browser test" }),
  });
  return (await res.json()).project.id;
}

describe("team work in the browser", () => {
  let owner: TestBrowser;
  let projectId: number;

  beforeAll(async () => {
    projectId = await newProjectAsChemist();
    owner = await launchBrowser();
    await signIn(owner.page, DEMO.chemist);
  });

  afterAll(async () => {
    await owner?.close();
  });

  test("an invitation e-mail's link lets a new person create an account and land in the project", async () => {
    const email = `invitee-${Date.now().toString(36)}@example.test`;
    await open(owner.page, `/projects/${projectId}/members`);
    await owner.page.locator("#invite-email").fill(email);
    await owner.page.locator("#invite-role").selectOption("auditor");
    await owner.page.getByRole("button", { name: "Send invitation" }).click();
    await owner.page.getByText(`Invitation sent to ${email}`).waitFor();
    await expect(owner.page.locator('[data-testid="pending-invitations"]').innerText()).resolves.toContain(email);
    await screenshot(owner.page, "team-members-invited");

    const link = await invitationLinkFor(email);
    const invitee = await launchBrowser();
    try {
      await invitee.page.goto(link);
      await invitee.page.locator('input[name="name"]').fill("Ines Invitee");
      await invitee.page.locator('input[name="password"]').fill("correct horse battery");
      await invitee.page.locator('input[name="confirm"]').fill("correct horse battery");
      await Promise.all([
        invitee.page.waitForURL((u) => u.pathname === `/projects/${projectId}`),
        invitee.page.getByRole("button", { name: "Create account and join" }).click(),
      ]);
      await expect(invitee.page.locator('[data-testid="project-role"]').innerText()).resolves.toBe("auditor");
      await screenshot(invitee.page, "team-invitee-landed");

      // The same link a second time says plainly that it was used.
      await invitee.page.goto(link);
      await expect(invitee.page.locator('[data-testid="invitation-state"]').getAttribute("data-state")).resolves.toBe("used");
      expect(invitee.foreignRequests).toEqual([]);
    } finally {
      await invitee.close();
    }
  });

  test("a share link opens read-only in a fresh browser without sign-in", async () => {
    // The seeded demo project, so that the ledger, the diagrams and the audit have something to show.
    const projects = await (await owner.page.request.get(`${BASE_URL}/api/v1/projects`)).json();
    const demoId = projects.projects.find((x: { name: string }) => x.name.includes("(demo)")).id as number;
    await open(owner.page, `/projects/${demoId}/members`);
    await owner.page.locator("#share-label").fill("coauthors");
    await owner.page.getByRole("button", { name: "Create link" }).click();
    const urlInput = owner.page.locator('[data-testid="new-share-url"]');
    await urlInput.waitFor();
    const shareUrl = await urlInput.inputValue();
    expect(shareUrl).toContain("/share/");
    await screenshot(owner.page, "team-members-share-link");

    const coauthor = await launchBrowser();
    try {
      const response = await coauthor.page.goto(shareUrl);
      expect(response?.status()).toBe(200);
      await expect(coauthor.page.locator('[data-testid="read-only-badge"]').innerText()).resolves.toBe("read only");
      await screenshot(coauthor.page, "team-share-overview");

      // A pathway: the app's own energy-profile drawing.
      await coauthor.page.locator("main a[href*='/pathways/']").first().click();
      await coauthor.page.locator('[data-testid="pathway-diagram"] svg').waitFor();
      const pathwayUrl = coauthor.page.url();
      await screenshot(coauthor.page, "team-share-pathway");

      // The ledger, and its unit switch (plain links: the values change, nothing is written).
      await coauthor.page.goto(`${shareUrl}/ledger`);
      const cell = coauthor.page.locator(".ag-row[row-index='0'] .ag-cell[col-id='deltaE']");
      await cell.waitFor({ timeout: 20000 });
      const kcal = (await cell.textContent())!.trim();
      await coauthor.page.locator('[data-testid="unit-kJ/mol"]').click();
      await coauthor.page.waitForURL((u) => u.searchParams.get("unit") === "kJ/mol");
      await expect.poll(async () => (await cell.textContent())!.trim(), { timeout: 10000 }).not.toBe(kcal);
      await screenshot(coauthor.page, "team-share-ledger-kj");

      // Nothing to change: no form that posts, no submit button, no editable field.
      for (const target of [shareUrl, `${shareUrl}/ledger`, pathwayUrl, `${shareUrl}/audit`]) {
        await coauthor.page.goto(target);
        await expect(coauthor.page.locator('form[method="post"], form[method="POST"]').count()).resolves.toBe(0);
        await expect(coauthor.page.locator('button[type="submit"], textarea, input:not([readonly])').count()).resolves.toBe(0);
      }
      await screenshot(coauthor.page, "team-share-audit");
      // The server refuses a write sent from the shared page itself.
      const status = await coauthor.page.evaluate(async (u) => (await fetch(u, { method: "POST", body: new URLSearchParams({ intent: "x" }) })).status, shareUrl);
      expect([403, 405]).toContain(status);
      const cookies = await coauthor.context.cookies();
      expect(cookies.filter((c) => c.name === "thermotally_session")).toEqual([]);
      expect(coauthor.foreignRequests).toEqual([]);
    } finally {
      await coauthor.close();
    }
  });
});
