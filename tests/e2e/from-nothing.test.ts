import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO, launchBrowser, open, screenshot, signIn, url, type TestBrowser } from "./harness";

/**
 * From nothing to a reaction energy, every value typed into the pages: a new project, a level, two
 * species, their energies, a protocol, the reaction; then the ledger's numbers are checked against the
 * hartree values entered. The example is our own invention: the isomerisation HNC -> HCN with made-up
 * (plausible) PBE0-D3(BJ)/def2-TZVP energies and thermal corrections.
 *
 * The Species and Calculations pages take geometries and electronic energies only; frequencies and
 * stored thermal corrections enter through the Import page (the project's own CSV template), which is
 * how this test gives ΔG what it needs.
 */

// Hartree to molar energies, CODATA 2018: Eh = 4.3597447222071e-18 J, N_A = 6.02214076e23 /mol,
// 1 kcal = 4184 J (thermochemical calorie) → 627.5094740631 kcal/mol and 2625.4996394799 kJ/mol.
const KCAL_PER_HARTREE = 627.5094740631; // CODATA 2018
const KJ_PER_HARTREE = 2625.4996394799; // CODATA 2018

// Invented electronic energies (hartree) at PBE0-D3(BJ)/def2-TZVP, and stored thermal corrections at 298.15 K.
const E = { HNC: "-93.372418", HCN: "-93.396271" } as const;
const THERMAL = {
  HNC: { zpe: "0.015048", h: "0.018551", g: "-0.003861" },
  HCN: { zpe: "0.016021", h: "0.019352", g: "-0.002984" },
} as const;
// Invented energy of iminoacetonitrile (HN=CH-CN, the HCN dimer) at the second level only.
const E_DIMER_SVP = "-186.612345";

const LEVEL_TZ = "PBE0-D3(BJ)/def2-TZVP";
const LEVEL_SVP = "PBE0-D3(BJ)/def2-SVP";

/** A value as the ledger shows it: two decimals, a real minus sign. */
const shown = (x: number) => x.toFixed(2).replace(/^-/, "−");

// ΔE and ΔG of HNC -> HCN from the numbers above (Δn = 0: no standard-state term).
const dEHartree = Number(E.HCN) - Number(E.HNC);
const dEZPEHartree = dEHartree + Number(THERMAL.HCN.zpe) - Number(THERMAL.HNC.zpe);
const dHHartree = dEHartree + Number(THERMAL.HCN.h) - Number(THERMAL.HNC.h);
const dGHartree = dEHartree + Number(THERMAL.HCN.g) - Number(THERMAL.HNC.g);

async function levelIds(page: Page, projectId: number): Promise<Record<string, number>> {
  const res = await page.request.get(url(`/api/v1/projects/${projectId}/levels`));
  const body = await res.json();
  return Object.fromEntries(body.levels.map((l: { id: number; name: string }) => [l.name, l.id]));
}

/** The reactions grid's row whose equation cell matches. */
const reactionRow = (page: Page, equation: RegExp) =>
  page.locator(".ag-row", { has: page.locator(".ag-cell[col-id='equation']", { hasText: equation }) });

const cellText = async (page: Page, equation: RegExp, col: string) => (await reactionRow(page, equation).locator(`.ag-cell[col-id='${col}']`).innerText()).trim();

describe("a reaction built from nothing through the pages", () => {
  let b: TestBrowser;
  let projectId: number;
  let base: string;

  beforeAll(async () => {
    b = await launchBrowser();
    await signIn(b.page, DEMO.chemist);
  });
  afterAll(async () => {
    await b?.close();
  });

  test("the chemist creates a project on the Projects page", async () => {
    const page = b.page;
    await open(page, "/projects");
    await page.locator('input[name="name"]').fill(`HCN isomers ${Date.now().toString(36)}`);
    await page.locator('input[name="description"]').fill("HNC -> HCN, typed in by hand");
    await Promise.all([page.waitForURL(/\/projects\/\d+$/), page.getByRole("button", { name: "Create project" }).click()]);
    projectId = Number(/\/projects\/(\d+)$/.exec(new URL(page.url()).pathname)![1]);
    expect(projectId).toBeGreaterThan(0);
    base = `/projects/${projectId}`;
  });

  test("adds a level from its parts on the Levels page", async () => {
    const page = b.page;
    await open(page, `${base}/levels`);
    const form = page.getByTestId("add-level");
    await form.locator('input[name="method"]').fill("PBE0");
    await form.locator('input[name="dispersion"]').fill("D3(BJ)");
    await form.locator('input[name="basis"]').fill("def2-TZVP");
    await form.getByRole("button", { name: "Add level" }).click();
    await page.getByText(`Added level ${LEVEL_TZ}`).waitFor();
    await expect(page.getByTestId("levels").innerText()).resolves.toContain(LEVEL_TZ);
  });

  test("adds the two species, with geometries, on the Species page", async () => {
    const page = b.page;
    await open(page, `${base}/species`);
    const form = page.getByTestId("add-species");
    // Linear molecules along z (Å; bond lengths from memory, rounded).
    const xyz = {
      HNC: "3\nHNC\nH 0.000 0.000 -0.995\nN 0.000 0.000 0.000\nC 0.000 0.000 1.169\n",
      HCN: "3\nHCN\nH 0.000 0.000 -1.066\nC 0.000 0.000 0.000\nN 0.000 0.000 1.153\n",
    };
    for (const label of ["HNC", "HCN"] as const) {
      await form.locator('input[name="label"]').fill(label);
      await form.locator('input[name="formula"]').fill(label === "HNC" ? "HNC" : "CHN");
      await form.locator('input[name="symmetryNumber"]').fill("1");
      await form.locator("#field-geometry").fill(xyz[label]);
      await form.getByRole("button", { name: "Add species" }).click();
      await page.getByTestId("species-message").getByText(`Added ${label}`).waitFor();
    }
    await page.locator(".ag-row[row-index='1'] .ag-cell[col-id='label']").getByText("HCN").waitFor();
  });

  test("enters both electronic energies on the Calculations page with Paste block…", async () => {
    const page = b.page;
    const tz = (await levelIds(page, projectId))[LEVEL_TZ]!;
    await open(page, `${base}/calculations`);
    // Rows in the order the species were added: HNC, then HCN.
    await page.locator(".ag-row[row-index='0'] .ag-cell[col-id='species']").getByText("HNC").waitFor();
    await page.locator(`.ag-row[row-index='0'] .ag-cell[col-id='level-${tz}']`).click();
    await page.getByTestId("paste-block-open").click();
    await page.locator("#paste-text").fill(`${E.HNC}\n${E.HCN}\n`);
    await page.getByTestId("paste-apply").click();
    await page.getByTestId("grid-message").getByText("Pasted 2 × 1 block: 2 added").waitFor();
    await expect.poll(() => page.locator(`.ag-row[row-index='1'] .ag-cell[col-id='level-${tz}']`).innerText()).toBe(E.HCN);
  });

  test("creates a protocol on the Protocols page (thermal corrections computed from frequencies)", async () => {
    const page = b.page;
    await open(page, `${base}/protocols`);
    const form = page.getByTestId("protocol-form");
    await form.locator('input[name="name"]').fill("PBE0 gas");
    await form.locator('select[name="energyLevel"]').selectOption({ label: LEVEL_TZ });
    await form.locator('select[name="thermalSource"]').selectOption("computed");
    await form.locator('input[name="temperature"]').fill("298.15");
    await form.getByRole("button", { name: "Add protocol" }).click();
    await page.getByText("Added PBE0 gas (the project's default)").waitFor();
  });

  test("adds HNC -> HCN on the Reactions page; ΔE is shown, ΔG is not, with the reason", async () => {
    const page = b.page;
    await open(page, `${base}/reactions`);
    await page.locator("#reaction-equation").fill("HNC -> HCN");
    await page.getByTestId("add-reaction").getByRole("button", { name: "Add" }).click();
    await page.getByRole("status").getByText("Added HNC -> HCN").waitFor();
    await reactionRow(page, /^HNC -> HCN$/).waitFor();
    await expect.poll(() => cellText(page, /^HNC -> HCN$/, "deltaE")).toBe(shown(dEHartree * KCAL_PER_HARTREE)); // −14.97
    expect(await cellText(page, /^HNC -> HCN$/, "deltaG")).toBe("—");
    // The breakdown says what is missing: frequencies at the thermal level, for both species.
    await reactionRow(page, /^HNC -> HCN$/).locator(".ag-cell[col-id='equation']").click();
    const breakdown = page.getByTestId("breakdown");
    await breakdown.getByTestId("breakdown-problems").waitFor();
    const problems = await breakdown.getByTestId("breakdown-problems").innerText();
    expect(problems).toContain(`HNC has no frequencies at ${LEVEL_TZ}`);
    expect(problems).toContain(`HCN has no frequencies at ${LEVEL_TZ}`);
  });

  test("stored thermal corrections come in through the Import page; the protocol switched to them gives ΔG", async () => {
    const page = b.page;
    const csv =
      "Species,Level,Thermal temperature (K),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree),Source note\n" +
      (["HNC", "HCN"] as const).map((s) => `${s},${LEVEL_TZ},298.15,${THERMAL[s].zpe},${THERMAL[s].h},${THERMAL[s].g},frequency job (invented)`).join("\n") +
      "\n";
    await open(page, `${base}/import`);
    await page.getByTestId("import-file").setInputFiles({ name: "thermal.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
    await page.getByTestId("import-preview-button").click();
    await page.getByTestId("import-preview").waitFor();
    await page.getByTestId("import-commit-button").click();
    await page.getByTestId("import-done").waitFor();

    // Still computed from frequencies: ΔG stays empty, and the reason points at the stored corrections.
    await open(page, `${base}/reactions`);
    await reactionRow(page, /^HNC -> HCN$/).locator(".ag-cell[col-id='equation']").click();
    await expect
      .poll(() => page.getByTestId("breakdown-problems").innerText())
      .toContain('it has stored corrections at 298.15 K, which a protocol with thermal source "stored" at that temperature would use');

    await open(page, `${base}/protocols`);
    await page.getByTestId("protocols").getByRole("link", { name: "Edit" }).click();
    const form = page.getByTestId("protocol-form");
    await form.getByText("Edit PBE0 gas").waitFor();
    await form.locator('select[name="thermalSource"]').selectOption("stored");
    await form.getByRole("button", { name: "Save" }).click();
    await page.getByText("Saved PBE0 gas").waitFor();

    await open(page, `${base}/reactions`);
    await reactionRow(page, /^HNC -> HCN$/).waitFor();
    expect(await cellText(page, /^HNC -> HCN$/, "deltaE")).toBe(shown(dEHartree * KCAL_PER_HARTREE)); // −14.97
    expect(await cellText(page, /^HNC -> HCN$/, "deltaEZPE")).toBe(shown(dEZPEHartree * KCAL_PER_HARTREE)); // −14.36
    expect(await cellText(page, /^HNC -> HCN$/, "deltaH")).toBe(shown(dHHartree * KCAL_PER_HARTREE)); // −14.47
    expect(await cellText(page, /^HNC -> HCN$/, "deltaG")).toBe(shown(dGHartree * KCAL_PER_HARTREE)); // −14.42
    expect(await cellText(page, /^HNC -> HCN$/, "status")).toContain("ok");

    await page.selectOption("[data-testid=unit-select]", "kJ/mol");
    await expect.poll(() => cellText(page, /^HNC -> HCN$/, "deltaE")).toBe(shown(dEHartree * KJ_PER_HARTREE)); // −62.63
    expect(await cellText(page, /^HNC -> HCN$/, "deltaEZPE")).toBe(shown(dEZPEHartree * KJ_PER_HARTREE)); // −60.07
    expect(await cellText(page, /^HNC -> HCN$/, "deltaH")).toBe(shown(dHHartree * KJ_PER_HARTREE)); // −60.52
    expect(await cellText(page, /^HNC -> HCN$/, "deltaG")).toBe(shown(dGHartree * KJ_PER_HARTREE)); // −60.32
    await expect(page.locator(".ag-header-cell[col-id='deltaG']").first().innerText()).resolves.toContain("kJ/mol");
  });

  test("a second level: a reaction whose species have energies at different levels is marked inconsistent, naming both", async () => {
    const page = b.page;
    await open(page, `${base}/levels`);
    const levelForm = page.getByTestId("add-level");
    await levelForm.locator('input[name="text"]').fill(LEVEL_SVP);
    await levelForm.getByRole("button", { name: "Add level" }).click();
    await page.getByText(`Added level ${LEVEL_SVP}`).waitFor();

    await open(page, `${base}/species`);
    const speciesForm = page.getByTestId("add-species");
    await speciesForm.locator('input[name="label"]').fill("NCCHNH");
    await speciesForm.locator('input[name="formula"]').fill("C2H2N2");
    await speciesForm.getByRole("button", { name: "Add species" }).click();
    await page.getByTestId("species-message").getByText("Added NCCHNH").waitFor();

    // The dimer's energy only at the second level, typed into its cell.
    const svp = (await levelIds(page, projectId))[LEVEL_SVP]!;
    await open(page, `${base}/calculations`);
    const cell = page.locator(`.ag-row[row-index='2'] .ag-cell[col-id='level-${svp}']`);
    await cell.waitFor();
    await cell.dblclick();
    await page.keyboard.press("Control+A");
    await page.keyboard.type(E_DIMER_SVP);
    await page.keyboard.press("Enter");
    await page.getByTestId("grid-message").getByText("NCCHNH: 1 added").waitFor();

    await open(page, `${base}/protocols`);
    const protocolForm = page.getByTestId("protocol-form");
    await protocolForm.locator('input[name="name"]').fill("PBE0 SVP");
    await protocolForm.locator('select[name="energyLevel"]').selectOption({ label: LEVEL_SVP });
    await protocolForm.getByRole("button", { name: "Add protocol" }).click();
    await page.getByText("Added PBE0 SVP").waitFor();

    // The reaction uses the second level's protocol: HCN has its energy at the first level only.
    await open(page, `${base}/reactions`);
    await page.locator("#reaction-equation").fill("2 HCN -> NCCHNH");
    await page.locator("#reaction-protocol").selectOption({ label: "PBE0 SVP" });
    await page.getByTestId("add-reaction").getByRole("button", { name: "Add" }).click();
    await page.getByRole("status").getByText("Added 2 HCN -> NCCHNH").waitFor();
    const dimer = /^2 HCN -> NCCHNH$/;
    await reactionRow(page, dimer).waitFor();
    await expect.poll(() => cellText(page, dimer, "status")).toContain("inconsistent");
    expect(await cellText(page, dimer, "deltaE")).toBe("—");
    await reactionRow(page, dimer).locator(".ag-cell[col-id='equation']").click();
    const problems = page.getByTestId("breakdown-problems");
    await expect
      .poll(() => problems.innerText())
      .toContain(`HCN has no electronic energy at ${LEVEL_SVP} (the protocol's energy level), only at ${LEVEL_TZ}`);
    expect(await problems.innerText()).toContain(`add a calculation at ${LEVEL_SVP} or choose another protocol`);

    // Under the first protocol the same reaction fails the other way round: the dimer lacks the first level.
    const first = await page.locator("[data-testid=protocol-select] option").evaluateAll((os) => (os as HTMLOptionElement[]).find((o) => o.textContent?.startsWith("PBE0 gas"))?.value);
    await page.selectOption("[data-testid=protocol-select]", first!);
    await expect
      .poll(() => problems.innerText())
      .toContain(`NCCHNH has no electronic energy at ${LEVEL_TZ} (the protocol's energy level), only at ${LEVEL_SVP}`);
    expect(await cellText(page, dimer, "status")).toContain("inconsistent");
    // The first reaction is untouched by the second level.
    expect(await cellText(page, /^HNC -> HCN$/, "status")).toContain("ok");
    await screenshot(page, "from-nothing-ledger");
  });

  test("no page requested another host", () => {
    expect(b.foreignRequests).toEqual([]);
  });
});
