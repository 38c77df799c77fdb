import Decimal from "decimal.js";
import { db } from "../../db";
import { principalOf } from "../../app/utils/guards.server";
import { createCalculation } from "../../app/services/calculations.server";
import { createLevel } from "../../app/services/levels.server";
import { createProtocol } from "../../app/services/protocols.server";
import { createConformer, createSpecies } from "../../app/services/species.server";
import { computeThermochemistry, HARTREE_TO_KCAL_PER_MOL } from "../../app/domain/thermo";
import type { DemoContext } from "./foundation";
import { DEMO_GEOMETRIES } from "./demo-geometries";

/**
 * The demo's ledger: an invented Ni(0)/P(OMe)3-catalysed hydrocyanation of 4-methoxystyrene to the
 * branched nitrile. Every number is made up to look plausible (energies roughly follow the formula,
 * frequency lists have 3N−6 modes, transition states one imaginary mode, every species and conformer has
 * a built 3D geometry from demo-geometries.ts, the stored corrections are the RRHO values at 1 atm of
 * those frequencies and geometries); none comes from a calculation or a publication. The cycle is tuned
 * to read like a working catalyst: C–CN reductive elimination limits the rate (energetic span about
 * 21.5 kcal/mol, TOF about 1e-3 s⁻¹ at 298.15 K under either protocol) and the overall hydrocyanation is
 * exergonic by about 23 kcal/mol. A few problems are planted on purpose for the audit:
 *   - TS-RE's single point at the ωB97X-D level is marked not converged;
 *   - Ni-alkyl (a minimum) has one small imaginary mode (−23.4 cm⁻¹);
 *   - HNiCN-L2 has no single point at the ωB97X-D level (the two steps through it are inconsistent);
 *   - the gas-phase protocol takes solvated single points with the 1 atm standard state.
 */
export type DemoSpeciesRole = "catalyst" | "ligand" | "reagent" | "substrate" | "intermediate" | "transition-state" | "product" | "off-cycle" | "solvent";

export const DEMO_SPECIES: { label: string; role: DemoSpeciesRole; what: string }[] = [
  { label: "NiL3", role: "catalyst", what: "Ni[P(OMe)3]3, the catalyst resting state" },
  { label: "NiL4", role: "off-cycle", what: "Ni[P(OMe)3]4, the off-cycle reservoir" },
  { label: "L", role: "ligand", what: "free trimethyl phosphite P(OMe)3" },
  { label: "HCN", role: "reagent", what: "hydrogen cyanide" },
  { label: "MeO-styrene", role: "substrate", what: "4-methoxystyrene" },
  { label: "nitrile", role: "product", what: "2-(4-methoxyphenyl)propanenitrile, the branched product" },
  { label: "NiL3-HCN", role: "intermediate", what: "HCN adduct of NiL3" },
  { label: "TS-OA", role: "transition-state", what: "oxidative addition of H–CN" },
  { label: "HNiCN-L3", role: "intermediate", what: "H–Ni–CN with three phosphites" },
  { label: "HNiCN-L2", role: "intermediate", what: "after loss of one phosphite" },
  { label: "HNiCN-L2-alkene", role: "intermediate", what: "alkene complex" },
  { label: "TS-ins", role: "transition-state", what: "migratory insertion of the alkene into Ni–H" },
  { label: "Ni-alkyl", role: "intermediate", what: "benzylic Ni alkyl cyanide" },
  { label: "TS-RE", role: "transition-state", what: "C–CN reductive elimination" },
  { label: "NiL2-nitrile", role: "intermediate", what: "product complex before release" },
  { label: "toluene", role: "solvent", what: "solvent, as a species at its neat concentration" },
];

// ---- invented energies ----
/** Rough per-element energies (hartree) at the geometry level so that absolute values fit the formula; invented for the demo. */
const INCREMENT: Record<string, string> = { H: "-0.5003", C: "-37.8461", N: "-54.5843", O: "-75.0612", P: "-341.2507", Ni: "-1507.8214" };
/** Per-element shift from the geometry level to the single-point level (larger basis, other functional); invented. */
const SP_INCREMENT: Record<string, string> = { H: "-0.0046", C: "-0.0392", N: "-0.0561", O: "-0.0743", P: "-0.1105", Ni: "-0.2630" };

function perElement(table: Record<string, string>, formula: Record<string, number>, salt: string) {
  let e = new Decimal(salt);
  for (const [el, n] of Object.entries(formula)) e = e.plus(new Decimal(table[el]!).times(n));
  return e;
}

/** Deterministic pseudo-random numbers (mulberry32), so that every seed run writes the same data. */
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

/** An invented but plausible harmonic spectrum: 3N−6 modes, soft modes first, C–H stretches last. */
function spectrum(atoms: number, hydrogens: number, seed: number, imaginary: number[] = []): number[] {
  const n = 3 * atoms - 6;
  const rand = rng(seed);
  const ch = Math.min(hydrogens, n - imaginary.length);
  const rest = n - imaginary.length - ch;
  const out: number[] = [...imaginary];
  for (let i = 0; i < rest; i++) {
    const x = (i + rand() * 0.8) / rest;
    out.push(Math.round((18 + 1750 * x ** 1.6) * 10) / 10);
  }
  for (let i = 0; i < ch; i++) out.push(Math.round((2950 + 200 * rand()) * 10) / 10);
  return out.sort((a, b) => a - b);
}

/**
 * Electronic energy of a species: either its own (reference molecules: per-element sum plus a salt at the
 * geometry level, plus the per-element shift and a small deviation at the single-point level), or a sum of
 * reference molecules plus a relative energy in kcal/mol at each level.
 */
type Energy =
  | { salt: string; spDeviation: string }
  | { from: Record<string, number>; relativeGeoKcal: number; relativeSpKcal: number };

type Def = {
  label: string;
  formula?: string;
  smiles?: string;
  counts: Record<string, number>;
  kind?: "minimum" | "transition-state";
  symmetryNumber?: number;
  geometry: string;
  conformers?: { label: string; geometry: string }[];
  concentrationMolL?: number;
  energy: Energy;
  imaginary?: number[];
  noSinglePoint?: boolean;
  singlePointNotConverged?: boolean;
};

const L = { C: 3, H: 9, O: 3, P: 1 };
const add = (...parts: Record<string, number>[]) => {
  const out: Record<string, number> = {};
  for (const p of parts) for (const [k, v] of Object.entries(p)) out[k] = (out[k] ?? 0) + v;
  return out;
};
const times = (p: Record<string, number>, n: number) => Object.fromEntries(Object.entries(p).map(([k, v]) => [k, v * n]));
const hill = (c: Record<string, number>) => {
  const order = ["C", "H", ...Object.keys(c).filter((k) => k !== "C" && k !== "H").sort()];
  return order.filter((k) => c[k]).map((k) => (c[k] === 1 ? k : `${k}${c[k]}`)).join("");
};

const NI = { Ni: 1 };
const HCN = { C: 1, H: 1, N: 1 };
const SUB = { C: 9, H: 10, O: 1 };
const NiL3 = add(NI, times(L, 3));
const NiL2 = add(NI, times(L, 2));
const BIG = add(NiL2, HCN, SUB);

/** What each complex is measured against: the resting state plus what it has taken up (minus what it has lost). */
const WITH_HCN = { NiL3: 1, HCN: 1 };
const WITH_HCN_LESS_L = { NiL3: 1, HCN: 1, L: -1 };
const WITH_ALKENE = { NiL3: 1, HCN: 1, "MeO-styrene": 1, L: -1 };

/**
 * The relative energies (kcal/mol) are invented so that the cycle reads like a working catalyst: binding
 * and insertion steps of a few kcal/mol, a C–CN reductive elimination that limits the rate, and an overall
 * hydrocyanation that is clearly exergonic. The geometry level binds a little more strongly (its
 * dispersion correction) and gives slightly lower barriers, so the two levels differ by a few kcal/mol
 * in the same direction for similar species.
 */
function definitions(): Def[] {
  const G = DEMO_GEOMETRIES;
  return [
    { label: "L", formula: hill(L), counts: L, symmetryNumber: 3, geometry: G.L(), energy: { salt: "-0.2431", spDeviation: "-0.0021" } },
    { label: "HCN", smiles: "C#N", counts: HCN, geometry: G.HCN(), energy: { salt: "-0.1372", spDeviation: "0.0034" } },
    {
      label: "MeO-styrene", smiles: "C=Cc1ccc(OC)cc1", counts: SUB, geometry: G.styrene("anti"),
      conformers: [{ label: "anti", geometry: G.styrene("anti") }, { label: "syn", geometry: G.styrene("syn") }],
      energy: { salt: "-0.4126", spDeviation: "0.0042" },
    },
    {
      label: "nitrile", smiles: "CC(C#N)c1ccc(OC)cc1", counts: add(SUB, HCN), geometry: G.nitrile("a"),
      conformers: [{ label: "a", geometry: G.nitrile("a") }, { label: "b", geometry: G.nitrile("b") }],
      energy: { from: { HCN: 1, "MeO-styrene": 1 }, relativeGeoKcal: -36.5, relativeSpKcal: -35.2 },
    },
    { label: "toluene", smiles: "Cc1ccccc1", counts: { C: 7, H: 8 }, geometry: G.toluene(), concentrationMolL: 9.4, energy: { salt: "-0.3338", spDeviation: "0.0027" } },
    { label: "NiL3", formula: hill(NiL3), counts: NiL3, symmetryNumber: 3, geometry: G.NiL3(), energy: { salt: "-0.9625", spDeviation: "-0.0063" } },
    { label: "NiL4", formula: hill(add(NiL3, L)), counts: add(NiL3, L), symmetryNumber: 12, geometry: G.NiL4(), energy: { from: { NiL3: 1, L: 1 }, relativeGeoKcal: -26.8, relativeSpKcal: -23.6 } },
    // The cycle.
    {
      label: "NiL3-HCN", formula: hill(add(NiL3, HCN)), counts: add(NiL3, HCN), geometry: G["NiL3-HCN"]("end-on"),
      conformers: [{ label: "end-on", geometry: G["NiL3-HCN"]("end-on") }, { label: "side-on", geometry: G["NiL3-HCN"]("side-on") }],
      energy: { from: WITH_HCN, relativeGeoKcal: -9.9, relativeSpKcal: -7.5 },
    },
    { label: "TS-OA", formula: hill(add(NiL3, HCN)), counts: add(NiL3, HCN), kind: "transition-state", geometry: G["TS-OA"](), imaginary: [-1186.4], energy: { from: WITH_HCN, relativeGeoKcal: 3.0, relativeSpKcal: 6.6 } },
    { label: "HNiCN-L3", formula: hill(add(NiL3, HCN)), counts: add(NiL3, HCN), geometry: G["HNiCN-L3"](), energy: { from: WITH_HCN, relativeGeoKcal: -7.9, relativeSpKcal: -5.0 } },
    { label: "HNiCN-L2", formula: hill(add(NiL2, HCN)), counts: add(NiL2, HCN), geometry: G["HNiCN-L2"](), noSinglePoint: true, energy: { from: WITH_HCN_LESS_L, relativeGeoKcal: 17.0, relativeSpKcal: 19.0 } },
    { label: "HNiCN-L2-alkene", formula: hill(BIG), counts: BIG, geometry: G["HNiCN-L2-alkene"](), energy: { from: WITH_ALKENE, relativeGeoKcal: -13.7, relativeSpKcal: -9.9 } },
    { label: "TS-ins", formula: hill(BIG), counts: BIG, kind: "transition-state", geometry: G["TS-ins"](), imaginary: [-463.7], energy: { from: WITH_ALKENE, relativeGeoKcal: -2.1, relativeSpKcal: 3.0 } },
    { label: "Ni-alkyl", formula: hill(BIG), counts: BIG, geometry: G["Ni-alkyl"](), imaginary: [-23.4], energy: { from: WITH_ALKENE, relativeGeoKcal: -19.9, relativeSpKcal: -15.3 } },
    { label: "TS-RE", formula: hill(BIG), counts: BIG, kind: "transition-state", geometry: G["TS-RE"](), imaginary: [-318.2], singlePointNotConverged: true, energy: { from: WITH_ALKENE, relativeGeoKcal: -0.5, relativeSpKcal: 5.5 } },
    { label: "NiL2-nitrile", formula: hill(BIG), counts: BIG, geometry: G["NiL2-nitrile"](), energy: { from: WITH_ALKENE, relativeGeoKcal: -33.7, relativeSpKcal: -28.8 } },
  ];
}

/** Absolute energies (hartree) of every definition at both levels, references first; invented. */
function energies(defs: Def[]): Map<string, { geo: Decimal; sp: Decimal }> {
  const out = new Map<string, { geo: Decimal; sp: Decimal }>();
  const perKcal = (kcal: number) => new Decimal(kcal).dividedBy(HARTREE_TO_KCAL_PER_MOL);
  for (const [i, d] of defs.entries()) {
    // Trailing digits from the seeded generator, so that energies carry the usual nine decimals.
    const noise = new Decimal(rng(7 + i)()).times("0.0001").toDecimalPlaces(9);
    if ("salt" in d.energy) {
      const geo = perElement(INCREMENT, d.counts, d.energy.salt).plus(noise);
      out.set(d.label, { geo, sp: geo.plus(perElement(SP_INCREMENT, d.counts, d.energy.spDeviation)) });
      continue;
    }
    let geo = perKcal(d.energy.relativeGeoKcal).plus(noise);
    let sp = perKcal(d.energy.relativeSpKcal).plus(noise);
    for (const [ref, n] of Object.entries(d.energy.from)) {
      const e = out.get(ref);
      if (!e) throw new Error(`demo energies: ${d.label} refers to ${ref} before it is defined`);
      geo = geo.plus(e.geo.times(n));
      sp = sp.plus(e.sp.times(n));
    }
    out.set(d.label, { geo: geo.toDecimalPlaces(9), sp: sp.toDecimalPlaces(9) });
  }
  return out;
}

const TEMPERATURE_K = 298.15;

/** Frequencies (cm⁻¹) and the stored RRHO corrections at 1 atm for one definition, as a program would report them. */
function vibrations(d: Def, i: number) {
  const n = atomCount(d.counts);
  const frequencies = d.label === "HCN" ? [727.3, 727.3, 2135.6, 3445.1] : spectrum(n, d.counts.H ?? 0, 1000 + i, d.imaginary);
  const t = computeThermochemistry({
    frequenciesCm1: frequencies, geometry: d.geometry, symmetryNumber: d.symmetryNumber ?? 1, multiplicity: 1, charge: 0,
    temperatureK: TEMPERATURE_K, lowFrequency: { treatment: "none" }, perMode: false,
  });
  const thermal = { temperature: TEMPERATURE_K, zpe: t.zpe.toFixed(6), enthalpyCorrection: t.enthalpyCorrection.toFixed(6), gibbsCorrection: t.gibbsCorrection.toFixed(6) };
  return { frequencies, thermal };
}

/** The demo's species with everything the seed stores for them (exported for checks of the demo data). */
export function demoLedgerData() {
  const defs = definitions();
  const e = energies(defs);
  return defs.map((d, i) => ({ ...d, electronic: e.get(d.label)!, ...vibrations(d, i) }));
}

const atomCount = (c: Record<string, number>) => Object.values(c).reduce((a, b) => a + b, 0);

/** Adds the demo's levels, species, conformers, calculations and protocols; skips a project that already has species. */
export async function seedLedgerData(context: DemoContext): Promise<void> {
  const { project, users } = context;
  const { models } = db();
  if ((await models.Species.count({ where: { projectId: project.id } })) > 0) return;
  const by = principalOf(users["chemist@demo.test"]!);

  const geo = (await createLevel(project, by, { method: "B3LYP-D3(BJ)", basis: "def2-SVP" })).level;
  const sp = (await createLevel(project, by, { method: "ωB97X-D", basis: "def2-TZVP", solvation: { model: "SMD", solvent: "toluene" } })).level;

  for (const d of demoLedgerData()) {
    await createSpecies(project, by, {
      label: d.label,
      formula: d.formula ?? null,
      smiles: d.smiles ?? null,
      kind: d.kind ?? "minimum",
      symmetryNumber: d.symmetryNumber ?? 1,
      geometry: { format: "xyz", data: d.geometry },
      concentrationMolL: d.concentrationMolL ?? null,
    });
    for (const c of d.conformers ?? []) await createConformer(project, by, d.label, { label: c.label, geometry: c.geometry });

    const eGeo = d.electronic.geo;
    await createCalculation(project, by, {
      species: d.label,
      level: geo.id,
      electronicEnergy: eGeo.toFixed(9),
      frequencies: d.frequencies,
      thermal: d.thermal,
      converged: true,
      source: "optimisation + frequencies (demo)",
    });
    for (const c of d.conformers ?? []) {
      await createCalculation(project, by, {
        species: d.label,
        conformer: c.label,
        level: geo.id,
        electronicEnergy: eGeo.plus(c === d.conformers![0] ? 0 : "0.0014").toFixed(9),
        source: `conformer ${c.label} (demo)`,
      });
    }
    if (!d.noSinglePoint) {
      await createCalculation(project, by, {
        species: d.label,
        level: sp.id,
        electronicEnergy: d.electronic.sp.toFixed(9),
        converged: !d.singlePointNotConverged,
        source: d.singlePointNotConverged ? "single point; SCF stopped at the iteration limit (demo)" : "single point (demo)",
      });
    }
  }

  await createProtocol(project, by, {
    name: "gas 1 atm, RRHO",
    energyLevel: sp.id,
    thermalLevel: geo.id,
    thermalSource: "stored",
    temperature: TEMPERATURE_K,
    standardState: "1 atm",
    lowFrequency: { treatment: "none", cutoff: 100 },
  });
  await createProtocol(project, by, {
    name: "solution 1 M, quasi-RRHO 100 cm⁻¹",
    energyLevel: sp.id,
    thermalLevel: geo.id,
    thermalSource: "computed",
    temperature: TEMPERATURE_K,
    standardState: "1 M",
    lowFrequency: { treatment: "grimme", cutoff: 100 },
    conformerTreatment: "boltzmann",
  });
}
