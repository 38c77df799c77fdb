import { afterEach, beforeEach, describe, expect, test } from "vitest";
import { DEMO, launchBrowser, open, screenshot, signIn, signOut, type TestBrowser } from "./harness";

/** Each demo account signs in and sees what its role allows; the server refuses the rest anyway. */
const DEMO_PROJECT = "Nickel-catalysed hydrocyanation of a vinylarene (demo)";

async function openDemoProject(b: TestBrowser) {
  await b.page.getByRole("link", { name: DEMO_PROJECT }).click();
  await b.page.getByTestId("project-name").waitFor();
  return b.page.url();
}

describe("roles in the browser", () => {
  let b: TestBrowser;
  beforeEach(async () => {
    b = await launchBrowser();
  });
  afterEach(async () => {
    expect(b.foreignRequests).toEqual([]);
    await b.close();
  });

  test("the owner sees the project with its management tabs, and a screenshot is kept", async () => {
    await signIn(b.page, DEMO.chemist);
    await openDemoProject(b);
    await expect(b.page.getByTestId("project-role").textContent()).resolves.toBe("owner");
    await expect(b.page.getByRole("link", { name: "Settings" }).count()).resolves.toBe(1);
    await b.page.getByRole("link", { name: "Members" }).click();
    await b.page.getByRole("button", { name: "Add" }).waitFor();
    await b.page.getByRole("link", { name: "Overview" }).click();
    await b.page.getByRole("heading", { name: "About this study" }).waitFor();
    await screenshot(b.page, "project-page-owner");
  });

  test("the viewer sees the project read-only, and the server refuses its write", async () => {
    await signIn(b.page, DEMO.coauthor);
    const projectUrl = await openDemoProject(b);
    await expect(b.page.getByTestId("project-role").textContent()).resolves.toBe("viewer");
    await expect(b.page.getByText("read only").count()).resolves.toBe(1);
    await expect(b.page.getByRole("link", { name: "Settings" }).count()).resolves.toBe(0);
    await b.page.getByRole("link", { name: "Members" }).click();
    await b.page.getByRole("heading", { name: "Roles" }).waitFor();
    await expect(b.page.getByRole("button", { name: "Add" }).count()).resolves.toBe(0);
    await expect(b.page.getByRole("button", { name: "Remove" }).count()).resolves.toBe(0);
    await screenshot(b.page, "project-page-viewer");

    // The same request a hidden form would send, from the viewer's own session.
    const status = await b.page.evaluate(async (url) => {
      const res = await fetch(`${url}/members`, {
        method: "POST",
        body: new URLSearchParams({ intent: "add", email: "admin@demo.test", role: "owner" }),
      });
      return res.status;
    }, projectUrl);
    expect(status).toBe(403);
    const settings = await open(b.page, new URL(projectUrl).pathname + "/settings");
    expect(settings.status()).toBe(403);
  });

  test("the auditor reads the project but has no management tab", async () => {
    await signIn(b.page, DEMO.supervisor);
    await openDemoProject(b);
    await expect(b.page.getByTestId("project-role").textContent()).resolves.toBe("auditor");
    await expect(b.page.getByRole("link", { name: "Settings" }).count()).resolves.toBe(0);
  });

  test("the site admin sees the users and outbox pages; others do not", async () => {
    await signIn(b.page, DEMO.admin);
    await expect(b.page.getByRole("link", { name: "Outbox" }).count()).resolves.toBe(1);
    await b.page.getByRole("link", { name: "Users" }).click();
    await b.page.getByText(DEMO.coauthor).waitFor();
    await signOut(b.context);
    await signIn(b.page, DEMO.chemist);
    await expect(b.page.getByRole("link", { name: "Outbox" }).count()).resolves.toBe(0);
    const outbox = await open(b.page, "/admin/outbox");
    expect(outbox.status()).toBe(404);
  });

  test("a new person signs up and creates a project", async () => {
    const email = `newcomer-${Date.now()}@demo.test`;
    await open(b.page, "/sign-up");
    await b.page.fill('input[name="name"]', "New Comer");
    await b.page.fill('input[name="email"]', email);
    await b.page.fill('input[name="password"]', "a long new password");
    await b.page.fill('input[name="confirm"]', "a long new password");
    await b.page.click('button[type="submit"]');
    await b.page.waitForURL(/\/projects$/);
    await b.page.fill('input[name="name"]', "My first study");
    await b.page.getByRole("button", { name: "Create project" }).click();
    await b.page.getByTestId("project-name").filter({ hasText: "My first study" }).waitFor();
  });
});
