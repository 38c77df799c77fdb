import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO, launchBrowser, open, screenshot, signIn, url, type TestBrowser } from "./harness";

/**
 * The reactions ledger, the pathway drawing and the audit in Chromium, on the seeded demo project
 * (reactions and a catalytic cycle over the invented Ni/phosphite scenario).
 */
async function demoProjectId(b: TestBrowser): Promise<number> {
  const res = await b.page.request.get(url("/api/v1/projects"));
  const body = await res.json();
  const p = body.projects.find((x: { name: string }) => x.name.includes("(demo)"));
  return p.id;
}

describe("reactions ledger and pathway in the browser", () => {
  let b: TestBrowser;
  let projectId: number;

  beforeAll(async () => {
    b = await launchBrowser();
    await signIn(b.page, DEMO.chemist);
    projectId = await demoProjectId(b);
  });
  afterAll(async () => {
    await b?.close();
  });

  test("the unit switch changes the displayed values without a page reload", async () => {
    const page = b.page;
    await open(page, `/projects/${projectId}/reactions`);
    const cell = page.locator(".ag-row[row-index='0'] .ag-cell[col-id='deltaE']");
    await cell.waitFor({ timeout: 20000 });
    const kcal = (await cell.textContent())!.trim();
    expect(kcal).toMatch(/^[−]?\d+\.\d{2}$/);
    // A marker on the window survives only if the page is not reloaded.
    await page.evaluate(() => ((window as unknown as { __noReload: boolean }).__noReload = true));
    await page.selectOption("[data-testid=unit-select]", "kJ/mol");
    await expect.poll(async () => (await cell.textContent())!.trim(), { timeout: 10000 }).not.toBe(kcal);
    const kj = (await cell.textContent())!.trim();
    const num = (t: string) => Number(t.replace("−", "-"));
    // 1 kcal/mol = 4.184 kJ/mol (thermochemical calorie); both rounded to 2 decimals.
    expect(Math.abs(num(kj) - num(kcal) * 4.184)).toBeLessThan(0.03);
    expect(await page.evaluate(() => (window as unknown as { __noReload?: boolean }).__noReload)).toBe(true);
    await expect(page.locator(".ag-header-cell[col-id='deltaE']").first().textContent()).resolves.toContain("kJ/mol");
    await expect(page.locator("[data-testid=safety-note]").textContent()).resolves.toContain("calorimetric");
    await screenshot(page, "ledger-reactions-kj");
    // The protocol switch recomputes in place too: the demo's second protocol (1 M, quasi-RRHO) moves ΔG.
    const g = page.locator(".ag-row[row-index='0'] .ag-cell[col-id='deltaG']");
    const gBefore = (await g.textContent())!.trim();
    const choice = await page.locator("[data-testid=protocol-select] option").evaluateAll((os) =>
      (os as HTMLOptionElement[]).find((o) => o.textContent?.includes("solution 1 M"))?.value,
    );
    await page.selectOption("[data-testid=protocol-select]", choice!);
    await expect.poll(async () => (await g.textContent())!.trim(), { timeout: 10000 }).not.toBe(gBefore);
    expect(await page.evaluate(() => (window as unknown as { __noReload?: boolean }).__noReload)).toBe(true);
    // A row opens its breakdown.
    await page.locator(".ag-row[row-index='0'] .ag-cell[col-id='equation']").click();
    await page.locator("[data-testid=breakdown]").waitFor({ timeout: 10000 });
    await expect.poll(async () => await page.locator("[data-testid=breakdown]").textContent(), { timeout: 10000 }).toContain("calculation #");
  });

  test("the pathway diagram downloads as SVG", async () => {
    const page = b.page;
    const list = await (await page.request.get(url(`/api/v1/projects/${projectId}/pathways`))).json();
    const pid = list.pathways[0].id;
    await open(page, `/projects/${projectId}/pathways/${pid}`);
    await page.locator("[data-testid=profile] svg").waitFor({ timeout: 10000 });
    await expect(page.locator("[data-testid=span]").textContent()).resolves.toContain("TOF");
    await screenshot(page, "ledger-pathway");
    const [download] = await Promise.all([page.waitForEvent("download"), page.click("[data-testid=download-svg]")]);
    expect(download.suggestedFilename()).toMatch(/\.svg$/);
    const file = await download.path();
    const text = fs.readFileSync(file!, "utf8");
    expect(text.startsWith("<svg")).toBe(true);
    expect(text).toContain("TS-OA");
    const [png] = await Promise.all([page.waitForEvent("download"), page.click("[data-testid=download-png]")]);
    expect(png.suggestedFilename()).toMatch(/\.png$/);
    const bytes = fs.readFileSync((await png.path())!);
    expect(bytes.subarray(1, 4).toString("latin1")).toBe("PNG");
  });

  test("the supervisor sees the audit grouped by severity, each finding linking to its object", async () => {
    const s = await launchBrowser();
    try {
      await signIn(s.page, DEMO.supervisor);
      await open(s.page, `/projects/${projectId}/audit`);
      await s.page.locator("[data-testid=audit-counts]").waitFor();
      await expect(s.page.locator("[data-testid=audit-warning]").count()).resolves.toBe(1);
      const link = s.page.locator("[data-testid=audit-warning] a").first();
      const href = await link.getAttribute("href");
      expect(href).toMatch(new RegExp(`^/projects/${projectId}/`));
      // Comments and acceptance are folded away under each finding; a click opens the forms.
      const review = s.page.locator("[data-testid=finding-review]").first();
      await expect(review.locator("input[aria-label=Accept]").isVisible()).resolves.toBe(false);
      await review.locator("summary").click();
      await expect(review.locator("input[aria-label=Accept]").isVisible()).resolves.toBe(true);
      await screenshot(s.page, "ledger-audit-supervisor");
      expect(s.foreignRequests).toEqual([]);
    } finally {
      await s.close();
    }
  });

  test("no page requested another host", () => {
    expect(b.foreignRequests).toEqual([]);
  });
});
