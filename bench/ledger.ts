/**
 * npm run bench:ledger — the reaction ledger at size: 2,000 species, 2 levels, 4,000 calculations with
 * 144-mode frequency lists, 1,000 reactions (half with a transition state). Seeds a fresh project with
 * bulk inserts, starts the built app on a free port, and prints median and p95 of
 *   - GET /api/v1/projects/:id/reactions (the computed ledger, JSON),
 *   - GET /projects/:id/reactions (the ledger page, server-rendered),
 *   - the same API read right after one calculation is edited (the recompute),
 *   - the bare SQL reads of the same rows (metadata only, and with the frequency and geometry blobs),
 * and the ratios. Targets on this machine: API < 300 ms median, page < 500 ms, a few times the bare reads.
 * Figures only: nothing here asserts a time.
 */
import { spawn, execFileSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { QueryTypes } from "sequelize";
import { closeDb, db } from "../db";
import { createApiToken } from "../app/services/tokens.server";
import { createUser, findUserByEmail } from "../app/services/users.server";

const ROOT = path.resolve(import.meta.dirname, "..");
const N_SPECIES = 2000;
const N_REACTIONS = 1000;
const ATOMS = 50; // 3N − 6 = 144 modes
const RUNS = Number(process.env.BENCH_RUNS ?? 30);

function stats(ms: number[]) {
  const s = [...ms].sort((a, b) => a - b);
  const q = (p: number) => s[Math.min(s.length - 1, Math.floor(p * (s.length - 1) + 0.5))]!;
  return { median: q(0.5), p95: q(0.95), min: s[0]!, max: s[s.length - 1]! };
}
const fmt = (x: number) => `${x.toFixed(1)} ms`;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, "127.0.0.1", () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
    srv.on("error", reject);
  });
}

/** A deterministic 50-atom geometry (a zig-zag chain C16H34 laid out in Å) and a 144-mode spectrum. */
function geometry(seed: number): string {
  const lines: string[] = [];
  for (let i = 0; i < 16; i++) {
    const x = i * 1.27, y = i % 2 ? 0.42 : -0.42;
    lines.push(`C ${x.toFixed(4)} ${y.toFixed(4)} ${(0.001 * seed % 0.01).toFixed(4)}`);
    lines.push(`H ${x.toFixed(4)} ${(y * 2.6).toFixed(4)} 0.8900`);
    lines.push(`H ${x.toFixed(4)} ${(y * 2.6).toFixed(4)} -0.8900`);
  }
  lines.push("H -1.0700 -0.4200 0.0000", "H 20.1200 0.4200 0.0000");
  return `${ATOMS}\nbench species ${seed}\n${lines.join("\n")}\n`;
}
function spectrum(seed: number, imaginary: boolean): number[] {
  const out: number[] = [];
  for (let i = 0; i < 144; i++) out.push(Math.round((30 + ((i * 37 + seed * 11) % 2900) + i * 3.1) * 10) / 10);
  out.sort((a, b) => a - b);
  if (imaginary) out[0] = -(400 + (seed % 900));
  return out;
}

async function seed() {
  const { sequelize, models } = db();
  const email = "bench@bench.test";
  const user = (await findUserByEmail(email)) ?? (await createUser({ email, name: "Bench", password: "bench-password-123" }));
  const project = await models.Project.create({ name: `bench ${new Date().toISOString()}`, description: "bench:ledger", createdBy: user.id });
  await models.Membership.create({ projectId: project.id, userId: user.id, role: "owner" });
  const t0 = performance.now();
  await sequelize.transaction(async (transaction) => {
    const [geo, sp] = await models.Level.bulkCreate(
      [
        { projectId: project.id, key: "b3lyp-d3(bj)/def2svp", method: "B3LYP", basis: "def2-SVP", dispersion: "D3(BJ)" },
        { projectId: project.id, key: "wb97xd/def2tzvp", method: "ωB97X-D", basis: "def2-TZVP" },
      ],
      { transaction },
    );
    const species = await models.Species.bulkCreate(
      Array.from({ length: N_SPECIES }, (_, i) => ({
        projectId: project.id, label: i % 2 && i < 2 * N_REACTIONS ? `TS${i}` : `S${i}`,
        // A transition state has the composition of its two reactants.
        formula: i % 2 && i < 2 * N_REACTIONS ? "C32H68" : "C16H34", charge: 0, multiplicity: 1,
        kind: (i % 2 && i < 2 * N_REACTIONS ? "transition-state" : "minimum") as "minimum" | "transition-state",
        symmetryNumber: 1, geometryXyz: geometry(i), notes: "",
      })),
      { transaction },
    );
    const calcs = species.flatMap((s, i) =>
      [geo!, sp!].map((l, j) => ({
        projectId: project.id, speciesId: s.id, levelId: l.id,
        electronicEnergyText: (-630.1234567 - j * 0.95 - ((i * 7919) % 1000) * 1e-5).toFixed(9),
        electronicEnergy: (-630.1234567 - j * 0.95 - ((i * 7919) % 1000) * 1e-5).toFixed(9),
        frequencies: spectrum(i + j, s.kind === "transition-state"), converged: true, sourceNote: "bench",
      })),
    );
    for (let i = 0; i < calcs.length; i += 500) await models.Calculation.bulkCreate(calcs.slice(i, i + 500), { transaction });
    const protocol = await models.Protocol.create(
      { projectId: project.id, name: "bench", energyLevelId: sp!.id, thermalLevelId: geo!.id, thermalSource: "computed", standardState: "1 M", lowFrequencyTreatment: "grimme" },
      { transaction },
    );
    await project.update({ defaultProtocolId: protocol.id }, { transaction });
    // Reactions: S(2k) + S(2k+2) -> S(2k+4) + S(2k+6) with TS(2k+1) on every other row.
    const minima = species.filter((s) => s.kind === "minimum");
    const reactions = await models.Reaction.bulkCreate(
      Array.from({ length: N_REACTIONS }, (_, r) => {
        const a = minima[r % minima.length]!, b = minima[(r + 1) % minima.length]!, c = minima[(r + 2) % minima.length]!, d = minima[(r + 3) % minima.length]!;
        return { projectId: project.id, equation: `${a.label} + ${b.label} -> ${c.label} + ${d.label}`, transitionStateId: r % 2 ? null : species[2 * r + 1]?.id ?? null, notes: "" };
      }),
      { transaction },
    );
    await models.ReactionTerm.bulkCreate(
      reactions.flatMap((row, r) => {
        const ids = [0, 1, 2, 3].map((k) => minima[(r + k) % minima.length]!.id);
        return ids.map((speciesId, k) => ({ reactionId: row.id, speciesId, side: (k < 2 ? "reactant" : "product") as "reactant" | "product", coefficient: "1", position: k }));
      }),
      { transaction },
    );
  });
  const seeded = performance.now() - t0;
  const { token } = await createApiToken(user, "bench");
  const calc = await models.Calculation.findOne({ where: { projectId: project.id }, order: [["id", "ASC"]] });
  return { projectId: project.id, token, seeded, calcId: calc!.id };
}

async function bareReads(projectId: number, blobs: boolean) {
  const { sequelize } = db();
  const q = (sql: string) => sequelize.query(sql, { type: QueryTypes.SELECT, replacements: { projectId } });
  const t = performance.now();
  await Promise.all([
    q("SELECT * FROM levels WHERE project_id = :projectId"),
    q(blobs ? "SELECT * FROM species WHERE project_id = :projectId" : "SELECT id, label, formula, smiles, charge, multiplicity, kind, symmetry_number, concentration_mol_l, version FROM species WHERE project_id = :projectId"),
    q(blobs ? "SELECT * FROM calculations WHERE project_id = :projectId" : "SELECT id, species_id, conformer_id, level_id, electronic_energy_text, thermal_temperature_k, zpe_hartree, enthalpy_correction_hartree, gibbs_correction_hartree, converged, version FROM calculations WHERE project_id = :projectId"),
    q("SELECT * FROM protocols WHERE project_id = :projectId"),
    q("SELECT * FROM reactions WHERE project_id = :projectId"),
    q("SELECT t.* FROM reaction_terms t JOIN reactions r ON r.id = t.reaction_id WHERE r.project_id = :projectId"),
  ]);
  return performance.now() - t;
}

async function main() {
  const buildDir = process.env.BENCH_BUILD_DIR ?? path.join(ROOT, ".data", "bench", "build");
  if (!fs.existsSync(path.join(buildDir, "server", "index.js")) || process.env.BENCH_REBUILD === "1") {
    console.error("building the app into .data/bench/build …");
    execFileSync("npx", ["react-router", "build"], { cwd: ROOT, stdio: ["ignore", "ignore", "inherit"], env: { ...process.env, BUILD_DIR: buildDir } });
  }
  console.error("seeding 2,000 species, 4,000 calculations (144 modes), 1,000 reactions …");
  const { projectId, token, seeded, calcId } = await seed();
  const port = await freePort();
  const server = spawn("node", ["server.js"], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), HOST: "127.0.0.1", BUILD_DIR: buildDir, NODE_ENV: "production", APP_URL: `http://localhost:${port}`, COOKIE_SECURE: "false" },
    stdio: ["ignore", "ignore", "inherit"],
  });
  const base = `http://127.0.0.1:${port}`;
  try {
    for (let i = 0; i < 120; i++) {
      try {
        if ((await fetch(`${base}/healthz`)).ok) break;
      } catch {
        /* not up yet */
      }
      await new Promise((r) => setTimeout(r, 250));
    }
    const headers = { Authorization: `Bearer ${token}` };
    const timeGet = async (url: string) => {
      const t = performance.now();
      const res = await fetch(url, { headers });
      const body = await res.text();
      if (!res.ok) throw new Error(`${url}: ${res.status} ${body.slice(0, 300)}`);
      return { ms: performance.now() - t, body };
    };
    const apiUrl = `${base}/api/v1/projects/${projectId}/reactions?unit=kcal/mol`;
    const cold = await timeGet(apiUrl);
    const answer = JSON.parse(cold.body);
    const byStatus: Record<string, number> = {};
    for (const r of answer.reactions) byStatus[r.status] = (byStatus[r.status] ?? 0) + 1;

    const apiTimes: number[] = [];
    for (let i = 0; i < RUNS; i++) apiTimes.push((await timeGet(apiUrl)).ms);
    const pageTimes: number[] = [];
    for (let i = 0; i < RUNS; i++) pageTimes.push((await timeGet(`${base}/projects/${projectId}/reactions`)).ms);
    const editTimes: number[] = [];
    const { models } = db();
    for (let i = 0; i < Math.min(RUNS, 15); i++) {
      const c = await models.Calculation.findByPk(calcId);
      const patch = await fetch(`${base}/api/v1/projects/${projectId}/calculations/${calcId}`, {
        method: "PATCH",
        headers: { ...headers, "Content-Type": "application/json" },
        body: JSON.stringify({ electronicEnergy: (-630.2 - i * 1e-6).toFixed(9), version: c!.version }),
      });
      if (!patch.ok) throw new Error(`edit failed: ${patch.status} ${await patch.text()}`);
      editTimes.push((await timeGet(apiUrl)).ms);
    }
    const bare: number[] = [];
    const bareBlobs: number[] = [];
    for (let i = 0; i < RUNS; i++) {
      bare.push(await bareReads(projectId, false));
      bareBlobs.push(await bareReads(projectId, true));
    }
    const a = stats(apiTimes), p = stats(pageTimes), e = stats(editTimes), b = stats(bare), bb = stats(bareBlobs);
    console.log(`bench:ledger — project ${projectId}: ${N_SPECIES} species, ${2 * N_SPECIES} calculations × 144 modes, ${N_REACTIONS} reactions (seeded in ${(seeded / 1000).toFixed(1)} s)`);
    console.log(`  statuses: ${Object.entries(byStatus).map(([k, v]) => `${k} ${v}`).join(", ")}; answer ${(cold.body.length / 1e6).toFixed(2)} MB`);
    console.log(`  first API read (cold caches: frequencies, geometries, RRHO)  ${fmt(cold.ms)}`);
    console.log(`  API  GET reactions            median ${fmt(a.median)}  p95 ${fmt(a.p95)}  (target < 300 ms median)`);
    console.log(`  page GET /projects/:id/reactions median ${fmt(p.median)}  p95 ${fmt(p.p95)}  (target < 500 ms)`);
    console.log(`  recompute after one edit      median ${fmt(e.median)}  p95 ${fmt(e.p95)}`);
    console.log(`  bare SQL reads, metadata      median ${fmt(b.median)}  p95 ${fmt(b.p95)}`);
    console.log(`  bare SQL reads, with blobs    median ${fmt(bb.median)}  p95 ${fmt(bb.p95)}`);
    console.log(`  ratios: API / bare ${(a.median / b.median).toFixed(1)}×, API / bare with blobs ${(a.median / bb.median).toFixed(1)}×, page / bare ${(p.median / b.median).toFixed(1)}×, edit / bare ${(e.median / b.median).toFixed(1)}×`);
  } finally {
    server.kill("SIGTERM");
    await closeDb();
  }
}

main().catch(async (error) => {
  console.error(error instanceof Error ? error.stack : error);
  await closeDb();
  process.exit(1);
});
