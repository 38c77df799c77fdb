import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { launchBrowser, open, screenshot, type TestBrowser } from "./harness";

describe("smoke: the served app in Chromium", () => {
  let browser: TestBrowser;

  beforeAll(async () => {
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  test("the home page answers 200", async () => {
    const response = await open(browser.page, "/");
    expect(response.status()).toBe(200);
    await screenshot(browser.page, "smoke-home");
  });

  test("the sign-in page answers 200 and shows its form", async () => {
    const response = await open(browser.page, "/sign-in");
    expect(response.status()).toBe(200);
    await expect(browser.page.locator('input[name="email"]').count()).resolves.toBe(1);
    await expect(browser.page.locator('input[name="password"]').count()).resolves.toBe(1);
    await screenshot(browser.page, "smoke-sign-in");
  });

  test("no page requested another host", () => {
    expect(browser.foreignRequests).toEqual([]);
  });
});
