import { closeDb } from "../db";
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedFoundation } from "./seed/foundation";
import { seedLedgerData } from "./seed/ledger-data";
import { seedLedgerReactions } from "./seed/ledger-reactions";

/**
 * The demo: an invented mechanism study and one account per role. Idempotent: a second run finds what
 * the first one made and changes nothing. Each part of the app adds its step below.
 */
async function main() {
  const context = await seedFoundation();
  const steps: ((c: typeof context) => Promise<void>)[] = [seedLedgerData, seedLedgerReactions];
  for (const step of steps) await step(context);
  if (!process.argv.includes("--quiet")) {
    console.log(`demo project: “${context.project.name}” (id ${context.project.id})`);
    console.log(`demo accounts (password ${DEMO_PASSWORD}): ${DEMO_ACCOUNTS.map((a) => `${a.email} (${a.what})`).join(", ")}`);
  }
  await closeDb();
}

main().catch(async (error) => {
  console.error(error instanceof Error ? error.stack : error);
  await closeDb();
  process.exit(1);
});
