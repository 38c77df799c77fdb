/**
 * Kinetics and equilibria: Eyring rate constants, first-order half-lives, equilibrium constants,
 * Boltzmann populations and ensemble free energies.
 *
 * Eyring (transition-state theory), J. Chem. Phys. 1935, 3, 107: k = κ (k_B T/h) exp(−ΔG‡/RT).
 * K = exp(−ΔG°/RT). G_ens = −RT ln Σ exp(−G_i/RT) (canonical ensemble of conformers, McQuarrie ch. 2).
 */
import type Decimal from "decimal.js";
import { H_PLANCK, HARTREE_TO_J_PER_MOL, K_B, R_GAS } from "./constants";
import { ThermoInputError, requirePositive, requireTemperature } from "./errors";
import { HDecimal, J_PER_MOL, assertQuantity, energy, toHartreeDecimal } from "./units";
import type { EnergyUnit, Quantity } from "./units";

const jPerMol = (q: Quantity, field: string) => {
  const c = assertQuantity(q, field);
  return c.value * J_PER_MOL[c.unit];
};

/** k_B T / h, s⁻¹. */
export function thermalFrequency(temperatureK: number): number {
  return (K_B * requireTemperature(temperatureK)) / H_PLANCK;
}

/** Eyring rate constant, s⁻¹ (first order; for a bimolecular step the unit follows the standard state). */
export function eyringRate(barrierG: Quantity, temperatureK: number, kappa = 1): number {
  const T = requireTemperature(temperatureK);
  requirePositive(kappa, "kappa");
  return kappa * thermalFrequency(T) * Math.exp(-jPerMol(barrierG, "barrierG") / (R_GAS * T));
}

/** t½ = ln 2 / k, s. */
export function halfLifeFirstOrder(rateConstant: number): number {
  return Math.LN2 / requirePositive(rateConstant, "rateConstant");
}

/** ΔG‡ giving half-life t½ (s) at T: ΔG‡ = RT ln(κ k_B T t½ / (h ln 2)). */
export function barrierForHalfLife<U extends EnergyUnit = "kcal/mol">(halfLifeS: number, temperatureK: number, unit?: U, kappa = 1): Quantity<U> {
  const t = requirePositive(halfLifeS, "halfLife");
  const T = requireTemperature(temperatureK);
  requirePositive(kappa, "kappa");
  const j = R_GAS * T * Math.log((kappa * thermalFrequency(T) * t) / Math.LN2);
  const u = (unit ?? "kcal/mol") as U;
  return energy(j / J_PER_MOL[u], u);
}

/** K = exp(−ΔG/RT). */
export function equilibriumConstant(deltaG: Quantity, temperatureK: number): number {
  const T = requireTemperature(temperatureK);
  return Math.exp(-jPerMol(deltaG, "deltaG") / (R_GAS * T));
}

/** Relative energies in J/mol from Quantities or absolute hartree decimal strings (exact differences). */
function relativeJ(values: ReadonlyArray<Quantity | string>): { rel: number[]; minIndex: number; min: Decimal | Quantity } {
  if (!Array.isArray(values) || values.length === 0) throw new ThermoInputError("energies", "energies must be a non-empty list.");
  if (values.every((v) => typeof v === "string")) {
    const d = (values as string[]).map((v, i) => toHartreeDecimal(v, `energies[${i}]`));
    let mi = 0;
    for (let i = 1; i < d.length; i++) if (d[i]!.lt(d[mi]!)) mi = i;
    return { rel: d.map((x) => x.minus(d[mi]!).toNumber() * HARTREE_TO_J_PER_MOL), minIndex: mi, min: d[mi]! };
  }
  if (values.some((v) => typeof v === "string")) throw new ThermoInputError("energies", "Do not mix decimal strings (hartree) with energies carrying units.");
  const j = (values as Quantity[]).map((q, i) => jPerMol(q, `energies[${i}]`));
  let mi = 0;
  for (let i = 1; i < j.length; i++) if (j[i]! < j[mi]!) mi = i;
  return { rel: j.map((x) => x - j[mi]!), minIndex: mi, min: values[mi] as Quantity };
}

/** Boltzmann populations p_i = exp(−G_i/RT)/Σ, computed relative to the minimum (no overflow). */
export function boltzmannPopulations(energies: ReadonlyArray<Quantity | string>, temperatureK: number): number[] {
  const T = requireTemperature(temperatureK);
  const { rel } = relativeJ(energies);
  const w = rel.map((e) => Math.exp(-e / (R_GAS * T)));
  const z = w.reduce((a, b) => a + b, 0);
  return w.map((x) => x / z);
}

/**
 * G_ens = −RT ln Σ exp(−G_i/RT) = G_min − RT ln Σ exp(−(G_i − G_min)/RT) (stable form).
 * Quantities in → Quantity in the unit of the first; absolute hartree strings in → hartree string out
 * (differences to the minimum taken in decimal, the correction added back in decimal).
 */
export function ensembleFreeEnergy(energies: readonly string[], temperatureK: number): string;
export function ensembleFreeEnergy<U extends EnergyUnit>(energies: ReadonlyArray<Quantity<U>>, temperatureK: number): Quantity<U>;
export function ensembleFreeEnergy(energies: ReadonlyArray<Quantity | string>, temperatureK: number): Quantity | string {
  const T = requireTemperature(temperatureK);
  const { rel, min } = relativeJ(energies);
  let z = 0;
  for (const e of rel) z += Math.exp(-e / (R_GAS * T));
  const corrJ = -R_GAS * T * Math.log(z);
  if (typeof energies[0] === "string") {
    return (min as Decimal).plus(new HDecimal(corrJ).div(HARTREE_TO_J_PER_MOL)).toString();
  }
  const q = min as Quantity;
  const u = (energies[0] as Quantity).unit;
  const minJ = q.value * J_PER_MOL[q.unit];
  return energy((minJ + corrJ) / J_PER_MOL[u], u);
}
