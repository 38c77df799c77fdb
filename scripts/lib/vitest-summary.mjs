// Prints the plain last line CI reads, "N passed, N failed", from vitest's JSON report.
//   node scripts/lib/vitest-summary.mjs test-results/vitest.json [vitest-exit-code]
// A test file that failed to load (no failed test inside, yet the file failed) counts as one
// failure; so does a vitest run that exited non-zero with nothing failed (unhandled errors), and a
// missing or unreadable report. Exit code: 0 only when something passed and nothing failed.
import fs from "node:fs";

const [file = "test-results/vitest.json", vitestCode = "0"] = process.argv.slice(2);
let passed = 0;
let failed = 0;
let skipped = 0;
const notes = [];
try {
  const report = JSON.parse(fs.readFileSync(file, "utf8"));
  passed = report.numPassedTests ?? 0;
  failed = report.numFailedTests ?? 0;
  skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
  for (const suite of report.testResults ?? []) {
    const failedInside = (suite.assertionResults ?? []).some((a) => a.status === "failed");
    if (suite.status === "failed" && !failedInside) {
      failed += 1;
      const firstLine = String(suite.message ?? "").split("\n")[0];
      notes.push(`failed to run: ${suite.name}${firstLine ? ` (${firstLine})` : ""}`);
    }
  }
  if (failed === 0 && Number(vitestCode) !== 0) {
    failed = 1;
    notes.push(
      passed === 0
        ? `vitest exited with code ${vitestCode} and ran no test`
        : `vitest exited with code ${vitestCode} although no test failed (unhandled error?)`,
    );
  }
} catch (err) {
  failed = 1;
  notes.push(`no readable vitest report at ${file}: ${err instanceof Error ? err.message : err}`);
}
if (passed + failed === 0) notes.push("no test ran");
for (const note of notes) console.error(`[thermotally] ${note}`);
if (skipped > 0) console.error(`[thermotally] ${skipped} skipped`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 && passed > 0 ? 0 : 1);
