/**
 * Is a total electronic energy plausible for a composition? A coarse screen for unit mix-ups and
 * pasted-in-the-wrong-row numbers, not a check of the method.
 *
 * The free-atom energies come from the Thomas–Fermi model with the Scott and Dirac–Schwinger
 * corrections, E(Z) ≈ −0.768745 Z^(7/3) + Z²/2 − 0.269900 Z^(5/3) hartree (J. Schwinger, Phys. Rev. A 24,
 * 2353 (1981); within about 1–2 % of Hartree–Fock atomic energies from carbon on). A molecule's energy is
 * the sum of its atoms' energies to within a fraction of a percent (binding energies are tiny beside
 * total energies).
 *
 *  - Too negative: more than 1.25 × the all-electron sum (relativistic effects make heavy atoms up to
 *    about 10 % deeper than the non-relativistic estimate; nothing goes deeper than that).
 *  - Too shallow: less than 0.5 × the sum over H–Ar only. Effective core potentials remove core energy
 *    from heavier atoms (a transition metal or iodine may then count a few per cent of its all-electron
 *    energy), so only atoms that are always treated all-electron bound it from this side; semi-empirical
 *    methods (energies on another scale) skip this side.
 */
import type { ElementCounts } from "./formula";
import { element } from "./elements";
import { ThermoInputError } from "./errors";
import { HARTREE_TO_KCAL_PER_MOL, HARTREE_TO_KJ_PER_MOL } from "./constants";

/** Thomas–Fermi–Scott–Dirac estimate of a neutral free atom's energy (hartree), Schwinger 1981. */
export function atomEnergyEstimateHartree(z: number): number {
  if (!Number.isInteger(z) || z < 1) throw new ThermoInputError("z", `atomic number must be a whole number ≥ 1 (got ${z}).`);
  return -0.768745 * z ** (7 / 3) + 0.5 * z * z - 0.2699 * z ** (5 / 3);
}

export type EnergyPlausibility = { ok: true } | { ok: false; reason: "positive" | "too-negative" | "too-shallow"; message: string; boundHartree?: number };

export function electronicEnergyPlausibility(
  counts: ElementCounts,
  energyHartree: number,
  options: { semiempirical?: boolean } = {},
): EnergyPlausibility {
  if (!Number.isFinite(energyHartree)) throw new ThermoInputError("energyHartree", "energy must be a finite number.");
  if (energyHartree >= 0) {
    return { ok: false, reason: "positive", message: `A total electronic energy is below zero; ${energyHartree} hartree looks like a relative energy or another unit` };
  }
  let all = 0;
  let light = 0;
  for (const [sym, n] of Object.entries(counts)) {
    const el = element(sym);
    if (!el) throw new ThermoInputError("formula", `Unknown element "${sym}".`);
    const e = atomEnergyEstimateHartree(el.z) * n;
    all += e;
    if (el.z <= 18) light += e;
  }
  const deepest = 1.25 * all;
  if (energyHartree < deepest) {
    // A number that would be plausible once divided by a molar-unit factor was most likely typed in that unit.
    const asUnit = [["kcal/mol", HARTREE_TO_KCAL_PER_MOL], ["kJ/mol", HARTREE_TO_KJ_PER_MOL]] as const;
    const hint = asUnit.find(([, f]) => energyHartree / f >= deepest && energyHartree / f <= 0.5 * Math.min(light, 0));
    return {
      ok: false,
      reason: "too-negative",
      boundHartree: deepest,
      message: `${energyHartree} hartree is deeper than the atoms of this formula can be (about ${all.toFixed(1)} hartree for the free atoms)${hint ? `; it looks like a value in ${hint[0]}` : ""}; check the unit and the row`,
    };
  }
  const shallowest = 0.5 * light;
  if (!options.semiempirical && light < 0 && energyHartree > shallowest) {
    return { ok: false, reason: "too-shallow", boundHartree: shallowest, message: `${energyHartree} hartree is far too shallow for this formula (its H–Ar atoms alone give about ${light.toFixed(1)} hartree); check the unit and the row` };
  }
  return { ok: true };
}

/** Estimate of a neutral free atom's energy (hartree) by atomic number (same model as above). */
export const atomicEnergyEstimate = atomEnergyEstimateHartree;

/** The screen above for an energy given as decimal text, answered as {plausible, message}. */
export function energyPlausibility(counts: ElementCounts, energyHartreeText: string | number, options: { semiempirical?: boolean } = {}): { plausible: boolean; message: string } {
  const value = typeof energyHartreeText === "number" ? energyHartreeText : Number(String(energyHartreeText).trim());
  if (!Number.isFinite(value)) return { plausible: false, message: `${JSON.stringify(String(energyHartreeText))} is not a number in hartree` };
  const r = electronicEnergyPlausibility(counts, value, options);
  return r.ok ? { plausible: true, message: "" } : { plausible: false, message: r.message };
}
