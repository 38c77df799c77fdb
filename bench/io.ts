/**
 * npm run bench:io — import and export at scale, against a real MariaDB (scripts/with-services.sh).
 *
 *  1. a 10,000-row CSV in the import template (2,000 species × 5 levels, with thermal corrections):
 *     parse + row checks, dry run against the project, commit (one transaction) — each timed;
 *  2. the Supporting Information workbook of a project with 2,000 species (each with a geometry, set up
 *     by a 2,000-frame XYZ import) and 1,000 reactions: gathering the data (ledger computation included)
 *     and writing the XLSX — each timed.
 * Prints figures; targets: import < 5 s, export < 3 s (the figures are shown, never asserted).
 */
import { performance } from "node:perf_hooks";
import { closeDb, db } from "../db";
import { parseImportFile, TEMPLATE_HEADINGS } from "../app/domain/import";
import { buildWorkbook } from "../app/domain/export/workbook";
import { gatherExportData } from "../app/services/exports.server";
import { importFile } from "../app/services/imports.server";
import { createProject } from "../app/services/projects.server";
import { createProtocol } from "../app/services/protocols.server";
import { createReaction } from "../app/services/reactions.server";
import { createUser } from "../app/services/users.server";

const SPECIES = 2000;
const LEVELS = ["B3LYP-D3(BJ)/def2-SVP", "B3LYP-D3(BJ)/def2-TZVP", "PBE0-D3(BJ)/def2-TZVP", "r2SCAN-3c/def2-mTZVPP", "wB97X-D/def2-TZVP"];
const REACTIONS = 1000;

const quote = (v: string) => (/[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);
const mb = () => `${(process.memoryUsage().rss / 1024 / 1024).toFixed(0)} MB rss`;

function csv(): string {
  const head = "Species,Formula,Charge,Multiplicity,Level,Electronic energy (hartree),Thermal temperature (K),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree),Converged,Source note";
  const lines = [head];
  for (let s = 0; s < SPECIES; s++) {
    for (const [i, level] of LEVELS.entries()) {
      // Benzene-sized invented isomers: plausible absolute energies near −232 hartree.
      const e = (-232.1 - i * 0.05 - (s % 997) * 1e-5 - s * 1e-9).toFixed(10);
      lines.push(["iso-" + s, "C6H6", "0", "1", level, e, "298.15", "0.100512", "0.106880", "0.071230", "yes", `bench row ${s}/${i}`].map(quote).join(","));
    }
  }
  return lines.join("\r\n") + "\r\n";
}

/** Every species once, as a benzene-like frame (Å), named in the comment line. */
function xyz(): string {
  const ring = Array.from({ length: 6 }, (_, k) => [Math.cos((k * Math.PI) / 3), Math.sin((k * Math.PI) / 3)]);
  const frames: string[] = [];
  for (let s = 0; s < SPECIES; s++) {
    const atoms = [...ring.map(([x, y]) => `C ${(1.39 * x!).toFixed(6)} ${(1.39 * y!).toFixed(6)} 0.000000`), ...ring.map(([x, y]) => `H ${(2.47 * x!).toFixed(6)} ${(2.47 * y!).toFixed(6)} 0.000000`)];
    frames.push(`12\nspecies=iso-${s}\n${atoms.join("\n")}\n`);
  }
  return frames.join("");
}

async function timed<T>(label: string, fn: () => Promise<T>): Promise<T> {
  const t0 = performance.now();
  const out = await fn();
  console.log(`${label.padEnd(44)} ${((performance.now() - t0) / 1000).toFixed(2).padStart(7)} s   (${mb()})`);
  return out;
}

async function main() {
  const suffix = Date.now().toString(36);
  const user = await createUser({ email: `bench-${suffix}@bench.test`, name: "Bench", password: "bench-password-123" });
  const by = { userId: user.id, label: "Bench <bench>" };
  const project = await createProject(user, by, { name: `bench io ${suffix}`, description: "" } as never);
  const projectRow = (await db().models.Project.findByPk((project as { id: number }).id))!;

  const text = csv();
  const bytes = new TextEncoder().encode(text);
  const file = { name: "bench.csv", type: "text/csv", bytes };
  console.log(`import file: ${(bytes.byteLength / 1024 / 1024).toFixed(1)} MB, ${SPECIES * LEVELS.length} rows (columns: ${TEMPLATE_HEADINGS.length} in the template)`);
  const importStart = performance.now();
  const parsed = await timed("import: parse + row checks (validate)", () => parseImportFile("bench.csv", bytes));
  if (!parsed || parsed.problems.length) throw new Error(`bench file has problems: ${JSON.stringify(parsed?.problems.slice(0, 3))}`);
  const dry = await timed("import: dry run against the project", () => importFile(projectRow, by, file, { dryRun: true }));
  const done = await timed("import: commit (one transaction)", () => importFile(projectRow, by, file, { dryRun: false }));
  console.log(`  dry run would create ${dry.summary.calculations.created} calculations; stored ${done.summary.calculations.created} calculations, ${done.summary.species.created} species, ${done.summary.levels.created} levels`);
  const importTotal = (performance.now() - importStart) / 1000;

  // Geometries for every species (one XYZ file of 2,000 frames), so that the export writes 2,000 coordinate blocks.
  const xyzFile = { name: "bench.xyz", type: "chemical/x-xyz", bytes: new TextEncoder().encode(xyz()) };
  const geo = await timed("import: 2,000-frame XYZ (set-up for the export)", () => importFile(projectRow, by, xyzFile, { dryRun: false }));
  console.log(`  species given a geometry: ${geo.summary.species.updated}`);

  // Export: a protocol and 1,000 reactions between the isomers (set-up, not timed).
  await createProtocol(projectRow, by, { name: "bench", energyLevel: "B3LYP-D3(BJ)/def2-TZVP", thermalSource: "stored" } as never);
  const t0 = performance.now();
  for (let r = 0; r < REACTIONS; r++) {
    await createReaction(projectRow, by, { equation: `iso-${2 * r} -> iso-${2 * r + 1}` } as never);
  }
  console.log(`(set-up: ${REACTIONS} reactions in ${((performance.now() - t0) / 1000).toFixed(1)} s)`);
  const exportStart = performance.now();
  const data = await timed("export: gather (ledger computed, audit)", () => gatherExportData(projectRow, user, { unit: "kcal/mol" }));
  const xlsx = await timed("export: write the XLSX", () => buildWorkbook(data));
  const exportTotal = (performance.now() - exportStart) / 1000;
  console.log(`  workbook ${(xlsx.byteLength / 1024 / 1024).toFixed(1)} MB: ${data.species.length} species, ${data.calculations.length} calculations, ${data.reactions.length} reactions, ${data.geometries.length} coordinate blocks`);
  console.log(`import total (validate + dry run + commit): ${importTotal.toFixed(2)} s (target < 5 s)`);
  console.log(`export total (gather + write):              ${exportTotal.toFixed(2)} s (target < 3 s)`);
  await timed("export: gather + write again (warm caches)", async () => buildWorkbook(await gatherExportData(projectRow, user, { unit: "kcal/mol" })));
}

main()
  .then(() => closeDb())
  .catch(async (e) => {
    console.error(e);
    await closeDb();
    process.exit(1);
  });
