/**
 * Helpers for browser tests: Debian's Chromium driven by playwright-core, against the app that
 * `npm test` serves at TEST_BASE_URL (http://localhost:3100).
 *
 *   const b = await launchBrowser();
 *   try {
 *     await signIn(b.page, DEMO.chemist, DEMO_PASSWORD);
 *     await screenshot(b.page, "project-page");
 *     expect(b.foreignRequests).toEqual([]);
 *   } finally {
 *     await b.close();
 *   }
 *
 * Every request to a host other than localhost / 127.0.0.1 / [::1] is recorded in
 * `foreignRequests` and aborted (the machine may be offline, and a page must never call out).
 */
import fs from "node:fs";
import path from "node:path";
import { chromium, type BrowserContext, type Page, type Response } from "playwright-core";

export const BASE_URL = (process.env.TEST_BASE_URL ?? "http://localhost:3100").replace(/\/$/, "");
export const RESULTS_DIR = path.resolve(import.meta.dirname, "../../test-results");
export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

export const DEMO_PASSWORD = "thermotally-demo";
export const DEMO = {
  admin: "admin@demo.test", // site admin
  chemist: "chemist@demo.test", // owner of the demo project
  supervisor: "supervisor@demo.test", // auditor
  coauthor: "coauthor@demo.test", // viewer
} as const;

const LOCAL_HOSTS = new Set(["localhost", "127.0.0.1", "[::1]", "::1"]);

/** True for http(s)/ws(s) URLs whose host is not this machine's loopback. data:, blob: etc. are local. */
export function isForeignUrl(url: string): boolean {
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    return false;
  }
  if (!["http:", "https:", "ws:", "wss:"].includes(parsed.protocol)) return false;
  return !LOCAL_HOSTS.has(parsed.hostname);
}

export interface TestBrowser {
  context: BrowserContext;
  /** The context's first page. */
  page: Page;
  /** Every request to another host, as "METHOD url" (a test asserts this stays empty). */
  foreignRequests: string[];
  /** A further page (tab) in the same context: shares cookies with `page`. */
  newPage(): Promise<Page>;
  /** Close the browser and delete its profile directory. */
  close(): Promise<void>;
}

export interface LaunchOptions {
  viewport?: { width: number; height: number };
  /** Let foreign requests through instead of aborting them (they are still recorded). */
  allowForeign?: boolean;
}

let profileCounter = 0;

/** A fresh headless Chromium with its own throwaway profile under test-results/. */
export async function launchBrowser(options: LaunchOptions = {}): Promise<TestBrowser> {
  const profilesDir = path.join(RESULTS_DIR, "browser-profiles");
  fs.mkdirSync(profilesDir, { recursive: true });
  const profile = fs.mkdtempSync(path.join(profilesDir, `p${process.pid}-${++profileCounter}-`));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: options.viewport ?? { width: 1440, height: 900 },
    locale: "en-GB",
    timezoneId: "UTC",
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
  context.setDefaultTimeout(15_000);
  context.setDefaultNavigationTimeout(30_000);

  const foreignRequests: string[] = [];
  context.on("request", (request) => {
    if (isForeignUrl(request.url())) foreignRequests.push(`${request.method()} ${request.url()}`);
  });
  if (!options.allowForeign) {
    await context.route(
      (url) => isForeignUrl(url.toString()),
      (route) => route.abort("blockedbyclient"),
    );
  }

  const page = context.pages()[0] ?? (await context.newPage());
  let closed = false;
  return {
    context,
    page,
    foreignRequests,
    newPage: () => context.newPage(),
    async close() {
      if (closed) return;
      closed = true;
      await context.close().catch(() => undefined);
      fs.rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Absolute URL for a path of the app under test. */
export function url(pathname: string): string {
  return `${BASE_URL}${pathname.startsWith("/") ? "" : "/"}${pathname}`;
}

/** Open a path of the app; returns the main response (after redirects). */
export async function open(page: Page, pathname: string): Promise<Response> {
  const response = await page.goto(url(pathname), { waitUntil: "load" });
  if (!response) throw new Error(`no response for ${pathname}`);
  // Pages that render (not error pages from the server) hydrate; wait until React has taken over.
  if (response.ok()) await page.waitForSelector("html[data-hydrated]", { state: "attached", timeout: 15_000 });
  return response;
}

/**
 * Sign in through the form at /sign-in and wait until the app lands on /projects.
 * Fails with the page's visible error text when the sign-in is refused.
 */
export async function signIn(page: Page, email: string, password: string = DEMO_PASSWORD): Promise<void> {
  await open(page, "/sign-in");
  await page.locator('input[name="email"]').fill(email);
  await page.locator('input[name="password"]').fill(password);
  try {
    await Promise.all([
      page.waitForURL((u) => u.pathname === "/projects" || u.pathname.startsWith("/projects/"), {
        timeout: 15_000,
      }),
      page.locator('button[type="submit"]').first().click(),
    ]);
    // The URL changes before the new page has rendered: wait for the signed-in frame.
    await page.waitForSelector('nav[aria-label="Main"]', { timeout: 15_000 });
  } catch (err) {
    const alert = await page
      .locator('[role="alert"]')
      .allInnerTexts()
      .catch(() => [] as string[]);
    throw new Error(
      `sign-in as ${email} did not reach /projects (now at ${page.url()})` +
        (alert.length ? `: ${alert.join(" / ")}` : "") +
        `: ${err instanceof Error ? err.message : String(err)}`,
    );
  }
}

/** Sign out by clearing the session cookie (independent of the UI). */
export async function signOut(context: BrowserContext): Promise<void> {
  await context.clearCookies();
}

/** Save a full-page PNG as test-results/screenshots/<name>.png; returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  const dir = path.join(RESULTS_DIR, "screenshots");
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name.replace(/[^A-Za-z0-9._-]+/g, "-")}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
