import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { api, DEMO, newProject } from "../integration/helpers";
import { launchBrowser, open, screenshot, signIn, type TestBrowser } from "./harness";

/** The species and calculations grids in Chromium: edit in place, paste a block, and read-only for a viewer. */
describe("ledger grids in the browser", () => {
  let chemist: TestBrowser;
  let project: { id: number; token: string };
  let levels: number[];

  beforeAll(async () => {
    project = await newProject(DEMO.chemist, [{ email: DEMO.coauthor, role: "viewer" }]);
    const post = (path: string, body: unknown) => api(`/api/v1/projects/${project.id}${path}`, { token: project.token, body });
    levels = [
      (await post("/levels", { method: "B3LYP-D3(BJ)", basis: "def2-SVP" })).body.level.id,
      (await post("/levels", { method: "ωB97X-D", basis: "def2-TZVP" })).body.level.id,
    ];
    await post("/species", { label: "H2O", formula: "H2O" });
    await post("/species", { label: "NH3", formula: "NH3" });
    chemist = await launchBrowser();
    await signIn(chemist.page, DEMO.chemist);
  });

  afterAll(async () => {
    await chemist?.close();
  });

  test("the chemist edits a species cell and the change is stored", async () => {
    const page = chemist.page;
    await open(page, `/projects/${project.id}/species`);
    const cell = page.locator(".ag-row[row-index='0'] .ag-cell[col-id='symmetryNumber']");
    await cell.waitFor();
    await cell.dblclick();
    await page.keyboard.press("Control+A");
    await page.keyboard.type("2");
    await page.keyboard.press("Enter");
    await page.getByTestId("species-message").getByText("Saved H2O").waitFor();
    const stored = await api(`/api/v1/projects/${project.id}/species/H2O`, { token: project.token });
    expect(stored.body.species.symmetryNumber).toBe(2);
    expect(stored.body.species.version).toBe(2);
    await screenshot(page, "ledger-species-grid");
  });

  test("the chemist pastes a 2 × 2 block into the calculations grid", async () => {
    const page = chemist.page;
    await open(page, `/projects/${project.id}/calculations`);
    const anchor = page.locator(`.ag-row[row-index='0'] .ag-cell[col-id='level-${levels[0]}']`);
    await anchor.waitFor();
    await anchor.click();
    // A spreadsheet copy arrives as a paste event carrying tab-separated text.
    await page.evaluate(() => {
      const data = new DataTransfer();
      data.setData("text/plain", "-76.4089123456789\t-76.4312\n-56.5478\t-56.5701\n");
      (document.activeElement ?? document.body).dispatchEvent(new ClipboardEvent("paste", { clipboardData: data, bubbles: true, cancelable: true }));
    });
    await page.getByTestId("grid-message").getByText("Pasted 2 × 2 block: 4 added").waitFor();
    const grid = await api(`/api/v1/projects/${project.id}/calculations/grid`, { token: project.token });
    const byLabel = Object.fromEntries(grid.body.rows.map((r: { label: string; cells: Record<string, { energy: string }> }) => [r.label, r.cells]));
    expect(byLabel.H2O[String(levels[0])].energy).toBe("-76.4089123456789");
    expect(byLabel.NH3[String(levels[1])].energy).toBe("-56.5701");
    // The display rounds to 6 decimals; the stored digits are kept.
    await expect(anchor.innerText()).resolves.toBe("-76.408912");
    await screenshot(page, "ledger-calculations-grid");
  });

  test("a block with a bad cell is refused whole, with the cell named", async () => {
    const page = chemist.page;
    await page.locator(`.ag-row[row-index='1'] .ag-cell[col-id='level-${levels[0]}']`).click();
    await page.getByTestId("paste-block-open").click();
    await page.locator("#paste-text").fill("-56.9\tabc");
    await page.getByTestId("paste-apply").click();
    await page.getByTestId("grid-message").getByText("nothing was changed").waitFor();
    await expect(page.getByTestId("grid-message").innerText()).resolves.toMatch(/row 1, column 2/);
    const grid = await api(`/api/v1/projects/${project.id}/calculations/grid`, { token: project.token });
    const nh3 = grid.body.rows.find((r: { label: string }) => r.label === "NH3");
    expect(nh3.cells[String(levels[0])].energy).toBe("-56.5478");
  });

  test("a cell that a reaction needs but that is empty is marked, and the grid numbers are right-aligned", async () => {
    const post = (path: string, body: unknown) => api(`/api/v1/projects/${project.id}${path}`, { token: project.token, body });
    // NH4OH has no calculation at all; the project's first protocol takes its energies from level 1.
    await post("/protocols", { name: "needs level 1", energyLevel: levels[1] });
    await post("/species", { label: "NH4OH", formula: "NH5O" });
    await post("/reactions", { equation: "NH3 + H2O -> NH4OH" });
    const page = chemist.page;
    await open(page, `/projects/${project.id}/calculations`);
    const cell = page.locator(`.ag-row[row-index='2'] .ag-cell[col-id='level-${levels[1]}']`);
    await cell.waitFor();
    await expect(cell.innerText()).resolves.toBe("missing");
    await expect(cell.getAttribute("class")).resolves.toMatch(/bg-red-50/);
    await expect(cell.getAttribute("class")).resolves.toMatch(/ag-right-aligned-cell/);
    // A cell behind no error carries no mark.
    const clean = page.locator(`.ag-row[row-index='0'] .ag-cell[col-id='level-${levels[0]}']`);
    await expect(clean.getAttribute("class")).resolves.not.toMatch(/bg-red-50|bg-amber-50/);
    await screenshot(page, "ledger-calculations-flags");
  });

  test("the chemist types frequencies and stored thermal corrections on a species page; a bad value is refused with its field named", async () => {
    const page = chemist.page;
    const nh3 = (await api(`/api/v1/projects/${project.id}/species/NH3`, { token: project.token })).body.species;
    await open(page, `/projects/${project.id}/species/${nh3.id}`);
    const form = page.getByTestId("add-calculation");
    await form.locator('select[name="level"]').selectOption(String(levels[0]));
    // Invented numbers in the range of a small molecule's modes and corrections.
    await form.locator("#calculation-frequencies").fill("1021.5 1650.2, 1650.9\n3410.7 3530.1 3531.0");
    await form.locator('input[name="thermalTemperature"]').fill("298.15");
    await form.locator('input[name="zpe"]').fill("abc");
    await form.locator('input[name="enthalpyCorrection"]').fill("0.037891");
    await form.locator('input[name="gibbsCorrection"]').fill("0.016012");
    await form.getByRole("button", { name: "Add calculation" }).click();
    await form.locator("#field-zpe-error").waitFor();
    await expect(form.locator("#field-zpe-error").innerText()).resolves.toContain("thermal.zpe must be a decimal number in hartree");
    const before = await api(`/api/v1/projects/${project.id}/calculations?species=NH3&level=${levels[0]}`, { token: project.token });
    expect(before.body.calculations.filter((c: { frequencies: unknown }) => c.frequencies)).toEqual([]);

    // What was typed stays in the form; correct the one field and send again.
    await form.locator('input[name="zpe"]').fill("0.034112");
    await form.getByRole("button", { name: "Add calculation" }).click();
    await page.getByText(/Added calculation #\d+ at B3LYP-D3\(BJ\)\/def2-SVP/).waitFor();
    const table = page.getByTestId("species-calculations");
    await expect(table.innerText()).resolves.toContain("at 298.15 K: ZPE 0.034112, H 0.037891, G 0.016012");
    await expect(table.getByTestId("frequencies").last().innerText()).resolves.toContain("3531.0");
    const after = await api(`/api/v1/projects/${project.id}/calculations?species=NH3&level=${levels[0]}`, { token: project.token });
    const stored = after.body.calculations.find((c: { frequencies: unknown }) => c.frequencies);
    expect(stored.frequencies).toEqual([1021.5, 1650.2, 1650.9, 3410.7, 3530.1, 3531.0]);
    expect(stored.thermal).toEqual({ temperature: 298.15, zpe: "0.034112", enthalpyCorrection: "0.037891", gibbsCorrection: "0.016012" });
    expect(stored.converged).toBe(true);
    await screenshot(page, "ledger-species-add-calculation");
  });

  test("the viewer sees the grids without any edit control", async () => {
    const viewer = await launchBrowser();
    try {
      await signIn(viewer.page, DEMO.coauthor);
      const page = viewer.page;
      await open(page, `/projects/${project.id}/species`);
      const cell = page.locator(".ag-row[row-index='0'] .ag-cell[col-id='symmetryNumber']");
      await cell.waitFor();
      await cell.dblclick();
      await expect(page.locator(".ag-cell-inline-editing").count()).resolves.toBe(0);
      await expect(page.getByTestId("add-species").count()).resolves.toBe(0);
      const h2o = (await api(`/api/v1/projects/${project.id}/species/H2O`, { token: project.token })).body.species;
      await open(page, `/projects/${project.id}/species/${h2o.id}`);
      await page.getByTestId("species-label").waitFor();
      await expect(page.getByTestId("add-calculation").count()).resolves.toBe(0);
      await expect(page.locator(".ag-cell[col-id='delete']").count()).resolves.toBe(0);
      await open(page, `/projects/${project.id}/calculations`);
      await page.locator(`.ag-row[row-index='0'] .ag-cell[col-id='level-${levels[0]}']`).dblclick();
      await expect(page.locator(".ag-cell-inline-editing").count()).resolves.toBe(0);
      await expect(page.getByTestId("paste-block-open").count()).resolves.toBe(0);
      await open(page, `/projects/${project.id}/levels`);
      await expect(page.getByTestId("add-level").count()).resolves.toBe(0);
      await open(page, `/projects/${project.id}/protocols`);
      await expect(page.getByTestId("protocol-form").count()).resolves.toBe(0);
      expect(viewer.foreignRequests).toEqual([]);
    } finally {
      await viewer.close();
    }
  });

  test("no page requested another host", () => {
    expect(chemist.foreignRequests).toEqual([]);
  });
});
