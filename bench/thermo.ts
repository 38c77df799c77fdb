/**
 * Benchmark of the RRHO engine: 10,000 invented species of 50 atoms (144 modes, a few below 100 cm⁻¹),
 * quasi-RRHO (Grimme) treatment. Prints species per second and wall time. A benchmark, not a timed test.
 *   npm run bench:thermo   (tsx bench/thermo.ts)
 */
import { computeThermochemistry } from "../app/domain/thermo/index";
import type { ThermoInput } from "../app/domain/thermo/index";

const N_SPECIES = 10_000;
const N_ATOMS = 50;
const N_MODES = 3 * N_ATOMS - 6; // 144

// Small deterministic PRNG (mulberry32) so runs are comparable.
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function buildSpecies(rand: () => number): ThermoInput {
  // Invented organic-like molecule: heavy atoms on a jittered 1.5 Å lattice, hydrogens 1.09 Å off them.
  const heavyPool = ["C", "C", "C", "C", "N", "O"];
  const symbols: string[] = [];
  const coordinates: number[][] = [];
  const nHeavy = 22;
  for (let i = 0; i < nHeavy; i++) {
    const x = (i % 4) * 1.5, y = (Math.floor(i / 4) % 3) * 1.5, z = Math.floor(i / 12) * 1.5;
    symbols.push(heavyPool[Math.floor(rand() * heavyPool.length)]!);
    coordinates.push([x + (rand() - 0.5) * 0.2, y + (rand() - 0.5) * 0.2, z + (rand() - 0.5) * 0.2]);
  }
  for (let i = nHeavy; i < N_ATOMS; i++) {
    const host = coordinates[Math.floor(rand() * nHeavy)]!;
    const th = Math.acos(2 * rand() - 1), ph = 2 * Math.PI * rand();
    symbols.push("H");
    coordinates.push([host[0]! + 1.09 * Math.sin(th) * Math.cos(ph), host[1]! + 1.09 * Math.sin(th) * Math.sin(ph), host[2]! + 1.09 * Math.cos(th)]);
  }
  const frequenciesCm1: number[] = [];
  const nSoft = 3 + Math.floor(rand() * 4); // 3–6 modes below 100 cm⁻¹
  for (let i = 0; i < N_MODES; i++) {
    if (i < nSoft) frequenciesCm1.push(15 + rand() * 80);
    else if (i < 110) frequenciesCm1.push(100 + rand() * 1700);
    else frequenciesCm1.push(2850 + rand() * 350);
  }
  return {
    frequenciesCm1, symbols, coordinates, symmetryNumber: 1, multiplicity: symbols.reduce((n, s) => n + ({ H: 1, C: 6, N: 7, O: 8 } as Record<string, number>)[s]!, 0) % 2 === 0 ? 1 : 2,
    temperatureK: 298.15, pressurePa: 101325, lowFrequency: { treatment: "grimme", cutoffCm1: 100 },
  };
}

const rand = rng(20240601);
const t0 = performance.now();
const species = Array.from({ length: N_SPECIES }, () => buildSpecies(rand));
const tBuild = performance.now() - t0;

function run(perMode: boolean): { ms: number; checksum: number } {
  const t = performance.now();
  let checksum = 0;
  for (const s of species) checksum += computeThermochemistry({ ...s, perMode }).gibbsCorrection;
  return { ms: performance.now() - t, checksum };
}

// First pass is cold (includes JIT warm-up): that is the figure that counts.
const lean = run(false); // ledger use: totals only
const withCharts = run(true); // as the calculator/API use it: per-mode entropies for the chart
const leanWarm = run(false);
const fmt = (ms: number) => `${(ms / 1000).toFixed(3)} s wall, ${Math.round(N_SPECIES / (ms / 1000)).toLocaleString("en-US")} species/s`;
console.log(`thermo bench: ${N_SPECIES} species × ${N_ATOMS} atoms × ${N_MODES} modes, Grimme quasi-RRHO, 298.15 K`);
console.log(`  build inputs:           ${(tBuild / 1000).toFixed(3)} s (not counted)`);
console.log(`  totals only (cold):      ${fmt(lean.ms)}`);
console.log(`  with per-mode entropies: ${fmt(withCharts.ms)}`);
console.log(`  totals only (warm):      ${fmt(leanWarm.ms)}`);
console.log(`  checksum ΣG_corr = ${withCharts.checksum.toFixed(6)} Eh (lean run agrees: ${Math.abs(withCharts.checksum - lean.checksum) < 1e-9})`);
