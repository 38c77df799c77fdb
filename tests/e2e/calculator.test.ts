import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO, launchBrowser, open, screenshot, signIn, type TestBrowser } from "./harness";

describe("thermochemistry calculator page", () => {
  let b: TestBrowser;
  beforeAll(async () => {
    b = await launchBrowser();
    await signIn(b.page, DEMO.chemist);
  });
  afterAll(async () => {
    await b?.close();
  });

  test("computes the example and switches the unit on the page", async () => {
    await open(b.page, "/tools/thermo");
    await b.page.getByRole("button", { name: "Fill in an example" }).click();
    await b.page.locator("textarea[name=frequencies]").inputValue().then((v) => expect(v).toContain("1638.2"));
    await b.page.getByRole("button", { name: "Compute" }).click();
    const results = b.page.getByTestId("calculator-results");
    await results.waitFor();
    const kcal = await results.textContent();
    expect(kcal).toMatch(/ZPE/);
    await b.page.getByLabel("Energy unit").selectOption("kJ/mol");
    const kj = await results.textContent();
    expect(kj).not.toBe(kcal);
    // The per-mode chart is drawn.
    await expect(b.page.getByRole("img", { name: "Entropy per mode" }).count()).resolves.toBe(1);
    await screenshot(b.page, "calculator");

    // A soft mode: the three treatments part below the cutoff, and the table keeps the unit's case.
    await b.page.locator("textarea[name=frequencies]").fill("42.5\n1638.2\n3812.5");
    await b.page.getByRole("button", { name: "Compute" }).click();
    await b.page.waitForFunction(
      (before) => document.querySelector("[data-testid=calculator-results]")?.textContent !== before,
      kj,
    );
    await expect(b.page.getByTestId("contributions").textContent()).resolves.toContain("kJ/mol");
    await screenshot(b.page, "calculator-soft-mode");
    expect(b.foreignRequests).toEqual([]);
  });
});
