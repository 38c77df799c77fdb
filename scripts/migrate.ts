import { SequelizeStorage, Umzug } from "umzug";
import { closeDb, db } from "../db";
import { migrations } from "../migrations";

/** `tsx scripts/migrate.ts up|down|status`: schema changes happen here only, never through sync(). */
async function main() {
  const command = process.argv[2] ?? "up";
  const { sequelize } = db();
  const umzug = new Umzug({
    migrations: migrations.map((m) => ({ name: m.name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "schema_migrations" }),
    logger: undefined,
  });
  if (command === "up") {
    const done = await umzug.up();
    console.log(done.length ? `migrated: ${done.map((m) => m.name).join(", ")}` : "schema is up to date");
  } else if (command === "down") {
    const undone = await umzug.down({ step: Number(process.argv[3] ?? 1) });
    console.log(`rolled back: ${undone.map((m) => m.name).join(", ") || "nothing"}`);
  } else if (command === "down-all") {
    await umzug.down({ to: 0 });
    console.log("rolled back every migration");
  } else if (command === "status") {
    const pending = await umzug.pending();
    const executed = await umzug.executed();
    console.log(`executed: ${executed.map((m) => m.name).join(", ") || "none"}`);
    console.log(`pending: ${pending.map((m) => m.name).join(", ") || "none"}`);
  } else {
    throw new Error(`unknown command "${command}": use up, down [steps], down-all or status`);
  }
  await closeDb();
}

main().catch(async (error) => {
  console.error(error instanceof Error ? error.message : error);
  await closeDb();
  process.exit(1);
});
