import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO, launchBrowser, open, screenshot, signIn, url, type TestBrowser } from "./harness";

describe("a chemist imports the template through the page", () => {
  let b: TestBrowser;
  let projectId: number;

  beforeAll(async () => {
    b = await launchBrowser();
    await signIn(b.page, DEMO.chemist);
    const res = await b.page.request.post(url("/api/v1/projects"), { data: { name: `import page ${Date.now().toString(36)}` } });
    expect(res.status()).toBe(201);
    projectId = (await res.json()).project.id;
  });

  afterAll(async () => {
    await b?.close();
  });

  test("downloads the template, uploads it, sees the preview, stores it, finds the values", async () => {
    const page = b.page;
    await open(page, `/projects/${projectId}/import`);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("template-csv").click()]);
    const path = await download.path();
    expect(download.suggestedFilename()).toMatch(/\.csv$/);

    // The browser keeps the download under a random name: hand it back under its own name, as a person would.
    await page.getByTestId("import-file").setInputFiles({ name: download.suggestedFilename(), mimeType: "text/csv", buffer: fs.readFileSync(path) });
    await page.getByTestId("import-preview-button").click();
    await page.getByTestId("import-preview").waitFor();
    const preview = await page.getByTestId("import-preview").innerText();
    expect(preview).toContain("HCN");
    expect(preview).toContain("create");
    expect(await page.getByTestId("summary-calculations-created").innerText()).toBe("3");
    // The template's example labels are new to this project, and the preview names them.
    expect(await page.getByTestId("import-new-species").innerText()).toContain("MeO-styrene (C9H10O)");
    await screenshot(page, "import-preview");
    // Nothing is stored before the commit.
    const before = await (await page.request.get(url(`/api/v1/projects/${projectId}/calculations`))).json();
    expect(before.calculations).toEqual([]);

    await page.getByTestId("import-commit-button").click();
    await page.getByTestId("import-done").waitFor();
    await screenshot(page, "import-done");
    const after = await (await page.request.get(url(`/api/v1/projects/${projectId}/calculations`))).json();
    // The template's first example row: HCN at −93.4461027381 hartree.
    expect(after.calculations.find((c: any) => c.species.label === "HCN")?.electronicEnergy).toBe("-93.4461027381");
  });

  test("a broken file shows the list of what to fix", async () => {
    const page = b.page;
    await open(page, `/projects/${projectId}/import`);
    await page.getByTestId("import-file").setInputFiles({
      name: "broken.csv",
      mimeType: "text/csv",
      buffer: Buffer.from("Species,Formula,Multiplicity,Level,Electronic energy (hartree)\nX,H2,2,B3LYP/def2-SVP,-1.17\n"),
    });
    await page.getByTestId("import-preview-button").click();
    await page.getByTestId("import-problems").waitFor();
    const text = await page.getByTestId("import-problems").innerText();
    expect(text).toContain("Multiplicity");
    expect(text).toMatch(/impossible/);
    await screenshot(page, "import-refused");
  });

  test("no page requested another host", () => {
    expect(b.foreignRequests).toEqual([]);
  });
});
