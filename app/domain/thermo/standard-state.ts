/**
 * Standard-state corrections.
 *
 * The RRHO free energy is for the ideal gas at the pressure P° used in the translational entropy
 * (1 atm or 1 bar). Moving one species from the gas standard state P° to a solution standard state of
 * concentration c (1 mol/L, or a solvent's own concentration, e.g. water 55.34 mol/L) adds
 *     ΔG° = RT ln(c R T / P°)        (c in mol m⁻³; ideal-gas volume change, common practice)
 * to its G: ≈ +1.89 kcal/mol at 298.15 K from 1 atm to 1 mol/L, ≈ +1.90 from 1 bar.
 */
import { ATM_PA, BAR_PA, HARTREE_TO_J_PER_MOL, HARTREE_TO_KCAL_PER_MOL, R_GAS } from "./constants";
import { ThermoInputError, requirePositive, requireTemperature } from "./errors";

export type GasStandardState = "1 atm" | "1 bar";
export type StandardState = GasStandardState | "1 M";

export function gasStandardPressurePa(state: GasStandardState | number): number {
  if (typeof state === "number") return requirePositive(state, "pressurePa");
  if (state === "1 atm") return ATM_PA;
  if (state === "1 bar") return BAR_PA;
  throw new ThermoInputError("standardState", `Gas standard state must be "1 atm" or "1 bar" (got ${JSON.stringify(state)}).`);
}

export interface StandardStateCorrection {
  /** Per particle, hartree: add to G. */
  hartree: number;
  kcalPerMol: number;
  jPerMol: number;
  description: string;
}

/**
 * ΔG° = RT ln(c R T / P°) for taking one species from the ideal gas at P° to concentration c (mol/L).
 * `from`: "1 atm", "1 bar" or a pressure in Pa; `concentrationMolL` default 1.
 */
export function solutionStandardStateCorrection(options: {
  temperatureK: number;
  from?: GasStandardState | number;
  concentrationMolL?: number;
}): StandardStateCorrection {
  const T = requireTemperature(options.temperatureK);
  const P = gasStandardPressurePa(options.from ?? "1 atm");
  const c = requirePositive(options.concentrationMolL ?? 1, "concentrationMolL");
  const j = R_GAS * T * Math.log((c * 1000 * R_GAS * T) / P);
  const fromText = typeof options.from === "number" ? `${options.from} Pa` : (options.from ?? "1 atm");
  const kcalPerMol = (j / HARTREE_TO_J_PER_MOL) * HARTREE_TO_KCAL_PER_MOL;
  return {
    hartree: j / HARTREE_TO_J_PER_MOL,
    kcalPerMol,
    jPerMol: j,
    description: `RT ln(cRT/P°) from the ideal gas at ${fromText} to ${c} mol/L at ${T} K: ${kcalPerMol.toFixed(3)} kcal/mol.`,
  };
}

export interface ResolvedStandardState {
  /** Pressure to use in the RRHO translational entropy, Pa. */
  pressurePa: number;
  /** Correction to add to each species' G, hartree (0 for a gas standard state). */
  correctionHartree: number;
  description: string;
}

/**
 * Maps a protocol's standard state to (RRHO pressure, per-species correction). "1 M" is computed at 1 atm
 * then corrected to 1 mol/L (or to `concentrationMolL` for a species with its own concentration).
 */
export function resolveStandardState(state: StandardState, temperatureK: number, concentrationMolL?: number): ResolvedStandardState {
  const T = requireTemperature(temperatureK);
  if (state === "1 atm" || state === "1 bar") {
    if (concentrationMolL !== undefined) {
      throw new ThermoInputError("concentrationMolL", `A concentration needs the "1 M" (solution) standard state, not ${state}.`);
    }
    return { pressurePa: gasStandardPressurePa(state), correctionHartree: 0, description: `Ideal gas at ${state}.` };
  }
  if (state === "1 M") {
    const c = solutionStandardStateCorrection({ temperatureK: T, from: "1 atm", concentrationMolL: concentrationMolL ?? 1 });
    return { pressurePa: ATM_PA, correctionHartree: c.hartree, description: c.description };
  }
  throw new ThermoInputError("standardState", `standardState must be "1 atm", "1 bar" or "1 M" (got ${JSON.stringify(state)}).`);
}
