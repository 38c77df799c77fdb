/**
 * Physical constants: the single source of numbers for the engine.
 *
 * Primary values are the CODATA 2018 recommended values (Tiesinga, Mohr, Newell, Taylor,
 * Rev. Mod. Phys. 2021, 93, 025010), each with its CODATA name and whether it is exact in the 2019 SI.
 * Everything else (R, hartree → kJ/mol, kcal/mol, eV, cm⁻¹, J/mol, ...) is COMPUTED below from them;
 * never retype a derived factor elsewhere.
 */

export const CODATA_EDITION = "CODATA 2018" as const;

export interface PhysicalConstant {
  /** Short symbol used in formulas. */
  readonly symbol: string;
  /** Name as listed by CODATA (or the defining document for non-CODATA conventions). */
  readonly name: string;
  readonly value: number;
  readonly unit: string;
  /** Exact by definition (2019 SI or convention) rather than measured. */
  readonly exact: boolean;
  readonly source: typeof CODATA_EDITION | "definition";
}

export const HARTREE_ENERGY: PhysicalConstant = {
  symbol: "E_h", name: "Hartree energy", value: 4.3597447222071e-18, unit: "J", exact: false, source: CODATA_EDITION,
};
export const AVOGADRO: PhysicalConstant = {
  symbol: "N_A", name: "Avogadro constant", value: 6.02214076e23, unit: "mol^-1", exact: true, source: CODATA_EDITION,
};
export const BOLTZMANN: PhysicalConstant = {
  symbol: "k", name: "Boltzmann constant", value: 1.380649e-23, unit: "J K^-1", exact: true, source: CODATA_EDITION,
};
export const PLANCK: PhysicalConstant = {
  symbol: "h", name: "Planck constant", value: 6.62607015e-34, unit: "J Hz^-1", exact: true, source: CODATA_EDITION,
};
export const SPEED_OF_LIGHT: PhysicalConstant = {
  symbol: "c", name: "speed of light in vacuum", value: 299792458, unit: "m s^-1", exact: true, source: CODATA_EDITION,
};
export const ATOMIC_MASS_CONSTANT: PhysicalConstant = {
  symbol: "m_u", name: "atomic mass constant", value: 1.6605390666e-27, unit: "kg", exact: false, source: CODATA_EDITION,
};
export const BOHR_RADIUS: PhysicalConstant = {
  symbol: "a_0", name: "Bohr radius", value: 0.529177210903e-10, unit: "m", exact: false, source: CODATA_EDITION,
};
export const ELECTRON_VOLT: PhysicalConstant = {
  symbol: "eV", name: "electron volt", value: 1.602176634e-19, unit: "J", exact: true, source: CODATA_EDITION,
};
/** Thermochemical calorie (exact by convention). */
export const THERMOCHEMICAL_CALORIE: PhysicalConstant = {
  symbol: "cal_th", name: "thermochemical calorie", value: 4.184, unit: "J", exact: true, source: "definition",
};
export const STANDARD_ATMOSPHERE: PhysicalConstant = {
  symbol: "atm", name: "standard atmosphere", value: 101325, unit: "Pa", exact: true, source: CODATA_EDITION,
};
export const BAR: PhysicalConstant = {
  symbol: "bar", name: "bar (IUPAC standard-state pressure)", value: 1e5, unit: "Pa", exact: true, source: "definition",
};

export const PRIMARY_CONSTANTS: readonly PhysicalConstant[] = [
  HARTREE_ENERGY, AVOGADRO, BOLTZMANN, PLANCK, SPEED_OF_LIGHT, ATOMIC_MASS_CONSTANT, BOHR_RADIUS, ELECTRON_VOLT,
  THERMOCHEMICAL_CALORIE, STANDARD_ATMOSPHERE, BAR,
];

// ---- plain-number aliases for the hot paths ----
export const E_H = HARTREE_ENERGY.value;
export const N_A = AVOGADRO.value;
export const K_B = BOLTZMANN.value;
export const H_PLANCK = PLANCK.value;
export const C_LIGHT = SPEED_OF_LIGHT.value;
export const M_U = ATOMIC_MASS_CONSTANT.value;
export const CAL = THERMOCHEMICAL_CALORIE.value;
export const ATM_PA = STANDARD_ATMOSPHERE.value;
export const BAR_PA = BAR.value;

// ---- derived (computed, never retyped) ----
/** Molar gas constant R = N_A k (exact in the 2019 SI), J mol⁻¹ K⁻¹. */
export const R_GAS = N_A * K_B;
/** 1 hartree per particle in J/mol. */
export const HARTREE_TO_J_PER_MOL = E_H * N_A;
export const HARTREE_TO_KJ_PER_MOL = HARTREE_TO_J_PER_MOL / 1000;
export const HARTREE_TO_KCAL_PER_MOL = HARTREE_TO_J_PER_MOL / (1000 * CAL);
export const HARTREE_TO_EV = E_H / ELECTRON_VOLT.value;
/** 1 hartree in wavenumbers, cm⁻¹: E_h / (h c), with c in cm/s. */
export const HARTREE_TO_CM1 = E_H / (H_PLANCK * C_LIGHT * 100);
/** Second radiation constant c₂ = h c / k in cm K: Θ_vib = c₂ ν̃. */
export const SECOND_RADIATION_CM_K = (H_PLANCK * C_LIGHT * 100) / K_B;
/** Bohr radius in ångström. */
export const BOHR_TO_ANGSTROM = BOHR_RADIUS.value * 1e10;
/** 1 u Å² in kg m². */
export const AMU_A2_TO_KG_M2 = M_U * 1e-20;
