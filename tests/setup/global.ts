/**
 * vitest globalSetup: `npm test` (scripts/test.sh) starts MariaDB, the fakes and the built app and
 * exports TEST_BASE_URL, DATABASE_URL, SMTP_*, MAILBOX_DIR and S3_* before vitest runs. Here we only
 * check that the app answers, so a broken server fails fast with one clear message instead of every
 * browser test timing out. Without TEST_BASE_URL (plain `npx vitest run tests/unit/...`) nothing is
 * checked: unit tests run; tests that need the app should be run through `npm test -- <file>`.
 */
export default async function setup(): Promise<void> {
  const base = process.env.TEST_BASE_URL;
  if (!base) {
    console.warn("[global setup] TEST_BASE_URL is not set: integration and browser tests need `npm test`");
    return;
  }
  const url = new URL("/healthz", base).toString();
  const deadline = Date.now() + 30_000;
  let last = "";
  while (Date.now() < deadline) {
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(3000) });
      if (res.ok) return;
      last = `HTTP ${res.status}`;
    } catch (err) {
      last = err instanceof Error ? err.message : String(err);
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`the app at ${base} does not answer ${url} (${last}); start it with npm test`);
}
