/**
 * Ideal-gas rigid-rotor harmonic-oscillator (RRHO) thermochemistry from harmonic frequencies.
 *
 * Formulas: McQuarrie, Statistical Mechanics (1976/2000), ch. 5–8 (translational: Sackur–Tetrode;
 * rigid rotor, classical high-T limit; harmonic oscillator; electronic spin degeneracy).
 * Low-frequency treatments:
 *  - "grimme": quasi-RRHO entropy, Grimme, Chem. Eur. J. 2012, 18, 9955: S = w S_V + (1 − w) S_R,
 *    w = 1/(1 + (ω₀/ν̃)^α), α = 4, ω₀ = cutoff (100 cm⁻¹), free-rotor entropy with μ' = μ B_av/(μ + B_av),
 *    μ = h/(8π²ν), B_av = 1e-44 kg m². ENTROPY ONLY: the paper interpolates the entropy; the enthalpy
 *    (ZPE and thermal energy) stays harmonic here.
 *  - "truhlar": Ribeiro, Marenich, Cramer, Truhlar, J. Phys. Chem. B 2011, 115, 14556: real modes below the
 *    cutoff are raised to the cutoff for the vibrational entropy and thermal energy; the ZPE keeps the
 *    computed (scaled) frequencies.
 * Output energies are per particle in hartree; entropies in J mol⁻¹ K⁻¹.
 */
import { ATM_PA, E_H, H_PLANCK, K_B, M_U, N_A, AMU_A2_TO_KG_M2, C_LIGHT, HARTREE_TO_CM1, R_GAS, SECOND_RADIATION_CM_K } from "./constants";
import { ThermoInputError, requireInteger, requirePositive, requireTemperature } from "./errors";
import { assertMultiplicity } from "./formula";
import { atomMasses, isAtom, isLinear, parseXyz, principalMomentsFromMasses, validateGeometry } from "./geometry";
import type { MassModel, Vec3 } from "./geometry";
import { element } from "./elements";

export type LowFrequencyTreatment = "none" | "grimme" | "truhlar";
export interface LowFrequencyOptions {
  treatment: LowFrequencyTreatment;
  /** ω₀ for grimme, raise-to value for truhlar, cm⁻¹; default 100. */
  cutoffCm1?: number;
}

export interface ThermoInput {
  /** Harmonic frequencies, cm⁻¹; imaginary modes as negative numbers (left out and reported). */
  frequenciesCm1: readonly number[];
  /** XYZ text (Å; last frame used) or symbols + coordinates. Alternatively top-level symbols/coordinates. */
  geometry?: string | { symbols: readonly string[]; coordinates: ReadonlyArray<readonly number[]> };
  symbols?: readonly string[];
  coordinates?: ReadonlyArray<readonly number[]>;
  /** Rotational symmetry number σ ≥ 1; default 1. */
  symmetryNumber?: number;
  /** Spin multiplicity 2S+1; default 1. */
  multiplicity?: number;
  /** Net charge, for the multiplicity check; default 0. */
  charge?: number;
  temperatureK?: number;
  /** Gas standard pressure, Pa; default 101325 (1 atm). */
  pressurePa?: number;
  /** One scale factor applied to every frequency; default 1. */
  frequencyScale?: number;
  lowFrequency?: LowFrequencyOptions;
  masses?: MassModel;
  /** Per-mode entropies under the three treatments (for a chart); default true. */
  perMode?: boolean;
}

export interface Contribution {
  /** J mol⁻¹ K⁻¹ */
  entropy: number;
  /** Thermal energy U(T) − U(0) of this degree of freedom, hartree (vibrational: without the ZPE). */
  energy: number;
}

export interface ThermoResult {
  temperatureK: number;
  pressurePa: number;
  units: { energy: "hartree"; entropy: "J/(mol K)" };
  zpe: number;
  /** H(T) − H(0) = E_trans + E_rot + E_vib(thermal) + kT. */
  thermalEnergy: number;
  /** ZPE + H(T) − H(0). */
  enthalpyCorrection: number;
  entropy: number;
  /** H_corr − T S. */
  gibbsCorrection: number;
  contributions: { translational: Contribution; rotational: Contribution; vibrational: Contribution; electronic: Contribution };
  imaginaryFrequencies: number[];
  linear: boolean;
  atom: boolean;
  principalMoments: Vec3;
  rotationalTemperaturesK: number[];
  symmetryNumber: number;
  multiplicity: number;
  frequencyScale: number;
  masses: MassModel;
  molecularMass: number;
  lowFrequency: {
    treatment: LowFrequencyTreatment;
    cutoffCm1: number;
    /** Indices (into the real, scaled modes) of modes below the cutoff. */
    affectedModes: number[];
    affectedFrequenciesCm1: number[];
    description: string;
  };
  perMode: null | {
    /** Real modes after scaling, cm⁻¹, in input order. */
    frequenciesCm1: number[];
    entropy: { none: number[]; grimme: number[]; truhlar: number[] };
  };
  warnings: string[];
}

// ---- precomputed constants ----
/** Grimme's average moment of inertia B_av, kg m². */
export const GRIMME_B_AV = 1e-44;
export const GRIMME_ALPHA = 4;
export const DEFAULT_CUTOFF_CM1 = 100;
const MAX_FREQUENCY_CM1 = 1e5;
/** μ = h/(8π²ν) with ν = c ν̃: μ = MU_PREFACTOR / ν̃[cm⁻¹], kg m². */
const MU_PREFACTOR = H_PLANCK / (8 * Math.PI * Math.PI * C_LIGHT * 100);
const ROT_TEMP_PREFACTOR = (H_PLANCK * H_PLANCK) / (8 * Math.PI * Math.PI * K_B * AMU_A2_TO_KG_M2); // Θ = this / I[u Å²]
const TRANSLATION_PREFACTOR = (2 * Math.PI * M_U * K_B) / (H_PLANCK * H_PLANCK); // × M[u] T

/** Harmonic-oscillator entropy of one mode in units of R at x = hcν̃/kT: x/(eˣ−1) − ln(1 − e⁻ˣ). */
export function harmonicEntropyR(x: number): number {
  const om = -Math.expm1(-x); // 1 − e^{−x}
  return (x * (1 - om)) / om - Math.log(om);
}
/** Free-rotor entropy in units of R for a mode of ν̃ (cm⁻¹), Grimme 2012 eq. (4)–(6). */
export function freeRotorEntropyR(nuCm1: number, temperatureK: number, bAv = GRIMME_B_AV): number {
  const mu = MU_PREFACTOR / nuCm1;
  const muPrime = (mu * bAv) / (mu + bAv);
  return 0.5 + 0.5 * Math.log((8 * Math.PI ** 3 * muPrime * K_B * temperatureK) / (H_PLANCK * H_PLANCK));
}

function resolveGeometry(input: ThermoInput): { symbols: readonly string[]; coordinates: ReadonlyArray<readonly number[]> | null } {
  if (typeof input.geometry === "string") {
    const frames = parseXyz(input.geometry);
    const f = frames[frames.length - 1]!;
    return { symbols: f.symbols, coordinates: f.coordinates };
  }
  if (input.geometry && typeof input.geometry === "object") {
    return { symbols: input.geometry.symbols, coordinates: input.geometry.coordinates ?? null };
  }
  if (input.symbols) return { symbols: input.symbols, coordinates: input.coordinates ?? null };
  throw new ThermoInputError("geometry", "A geometry (XYZ text or symbols + coordinates in Å) is needed for the masses and moments of inertia.");
}

/** RRHO thermochemistry of one species. See the module comment for formulas and sources. */
export function computeThermochemistry(input: ThermoInput): ThermoResult {
  if (typeof input !== "object" || input === null) throw new ThermoInputError("input", "input must be an object.");
  const T = requireTemperature(input.temperatureK ?? 298.15);
  const P = requirePositive(input.pressurePa ?? ATM_PA, "pressurePa");
  const sigma = requireSymmetryNumber(input.symmetryNumber ?? 1);
  const mult = requireInteger(input.multiplicity ?? 1, "multiplicity", 1);
  const charge = input.charge ?? 0;
  if (!Number.isInteger(charge)) throw new ThermoInputError("charge", `charge must be a whole number (got ${String(charge)}).`);
  const scale = requirePositive(input.frequencyScale ?? 1, "frequencyScale");
  const lf = input.lowFrequency ?? { treatment: "none" as const };
  const treatment = lf.treatment;
  if (treatment !== "none" && treatment !== "grimme" && treatment !== "truhlar") {
    throw new ThermoInputError("lowFrequency.treatment", `lowFrequency.treatment must be "none", "grimme" or "truhlar" (got ${JSON.stringify(treatment)}).`);
  }
  const cutoff = requirePositive(lf.cutoffCm1 ?? DEFAULT_CUTOFF_CM1, "lowFrequency.cutoffCm1");
  const massModel = input.masses ?? "isotopic";
  const warnings: string[] = [];

  const { symbols, coordinates } = resolveGeometry(input);
  if (!Array.isArray(symbols) || symbols.length === 0) throw new ThermoInputError("symbols", "symbols must be a non-empty list of element symbols.");
  const nAtoms = symbols.length;
  const m = atomMasses(symbols, massModel);
  let moments: Vec3 = [0, 0, 0];
  if (nAtoms > 1) {
    if (!coordinates) throw new ThermoInputError("geometry", `A polyatomic species (${nAtoms} atoms) needs coordinates for its moments of inertia.`);
    validateGeometry(symbols, coordinates);
    moments = principalMomentsFromMasses(m, coordinates);
    if (!moments.every(Number.isFinite)) throw new ThermoInputError("geometry", "The coordinates are too large for moments of inertia (Å expected).");
    if (isAtom(moments)) throw new ThermoInputError("geometry", "All atoms sit at one point; check the coordinates (Å).");
  }
  const atom = nAtoms === 1;
  const linear = !atom && isLinear(moments);

  // electrons and multiplicity
  let z = 0;
  for (const s of symbols) z += element(s)!.z;
  if (z - charge < 0) throw new ThermoInputError("charge", `A charge of ${charge} leaves ${z - charge} electrons.`);
  assertMultiplicity(z - charge, mult);

  // frequencies
  const freqs = input.frequenciesCm1;
  if (!Array.isArray(freqs)) throw new ThermoInputError("frequenciesCm1", "frequenciesCm1 must be a list of numbers (cm⁻¹).");
  const nf = freqs.length;
  const real = new Float64Array(nf);
  let nReal = 0;
  const imaginary: number[] = [];
  for (let i = 0; i < nf; i++) {
    const f = freqs[i];
    if (typeof f !== "number" || !Number.isFinite(f)) throw new ThermoInputError(`frequenciesCm1[${i}]`, `frequenciesCm1[${i}] must be a finite number (got ${String(f)}).`);
    if (f === 0) throw new ThermoInputError(`frequenciesCm1[${i}]`, `frequenciesCm1[${i}] is 0; leave translations and rotations out of the list.`);
    if (f < 0) imaginary.push(f);
    // No molecular vibration comes near 1e5 cm⁻¹ (H₂'s is 4401 cm⁻¹, from memory): a larger value is a unit mix-up.
    else if (f * scale > MAX_FREQUENCY_CM1) throw new ThermoInputError(`frequenciesCm1[${i}]`, `frequenciesCm1[${i}] is ${f * scale} cm⁻¹ after scaling; vibrations lie below ${MAX_FREQUENCY_CM1} cm⁻¹ (check the unit).`);
    else real[nReal++] = f * scale;
  }
  if (atom && nf > 0) throw new ThermoInputError("frequenciesCm1", "An atom has no vibrations; give an empty list of frequencies.");
  const expected = atom ? 0 : 3 * nAtoms - (linear ? 5 : 6);
  if (nf > expected) throw new ThermoInputError("frequenciesCm1", `${nf} frequencies for ${nAtoms} atoms (${linear ? "linear" : "non-linear"}): at most 3N − ${linear ? 5 : 6} = ${expected}.`);
  if (nf < expected) warnings.push(`${nf} frequencies given; a ${linear ? "linear" : "non-linear"} molecule of ${nAtoms} atoms has ${expected}.`);
  if (imaginary.length > 0) warnings.push(`${imaginary.length} imaginary mode(s) left out: ${imaginary.join(", ")} cm⁻¹.`);

  const kT = K_B * T;
  const kT_Eh = kT / E_H;

  // translational (Sackur–Tetrode): S/R = ln[(2π m kT/h²)^{3/2} kT/P] + 5/2; E = 3/2 kT
  let M = 0;
  for (let i = 0; i < nAtoms; i++) M += m[i]!;
  const sTransR = 1.5 * Math.log(TRANSLATION_PREFACTOR * M * T) + Math.log(kT / P) + 2.5;
  const eTrans = 1.5 * kT_Eh;

  // rotational, classical rigid rotor: Θ_i = h²/(8π² I_i k)
  let sRotR = 0, eRot = 0;
  const rotTemps: number[] = [];
  if (linear) {
    const theta = ROT_TEMP_PREFACTOR / moments[2];
    rotTemps.push(theta);
    sRotR = Math.log(T / (sigma * theta)) + 1; // McQuarrie eq. 6-47 / S = R(ln(T/σΘ) + 1)
    eRot = kT_Eh;
    if (T < 5 * theta) warnings.push(`T is not ≫ Θ_rot (${theta.toPrecision(3)} K); the classical rotor is approximate.`);
  } else if (!atom) {
    const ta = ROT_TEMP_PREFACTOR / moments[0], tb = ROT_TEMP_PREFACTOR / moments[1], tc = ROT_TEMP_PREFACTOR / moments[2];
    rotTemps.push(ta, tb, tc);
    // S/R = ln[(√π/σ) T^{3/2}/√(ΘAΘBΘC)] + 3/2 (McQuarrie eq. 8-23)
    sRotR = Math.log((Math.sqrt(Math.PI) / sigma) * Math.pow(T, 1.5) / Math.sqrt(ta * tb * tc)) + 1.5;
    eRot = 1.5 * kT_Eh;
  }

  // vibrational (harmonic), with the low-frequency treatment; one pass, no allocation unless perMode
  const c2T = SECOND_RADIATION_CM_K / T; // x = c₂ ν̃ / T
  let zpeCm1 = 0, eVibKT = 0, sVibR = 0;
  const affected: number[] = [];
  const affectedF: number[] = [];
  const grimmeG = (8 * Math.PI ** 3 * K_B * T) / (H_PLANCK * H_PLANCK);
  const cut4 = cutoff ** GRIMME_ALPHA;
  const wantPerMode = input.perMode !== false;
  const pmNone: number[] = wantPerMode ? new Array(nReal) : [];
  const pmGrimme: number[] = wantPerMode ? new Array(nReal) : [];
  const pmTruhlar: number[] = wantPerMode ? new Array(nReal) : [];
  // Truhlar's raised-mode values are the same for every raised mode: compute once.
  const xCut = c2T * cutoff;
  const omCut = -Math.expm1(-xCut);
  const eCutKT = (xCut * (1 - omCut)) / omCut;
  const sCutR = eCutKT - Math.log(omCut);
  for (let i = 0; i < nReal; i++) {
    const nu = real[i]!;
    zpeCm1 += nu;
    const low = nu < cutoff;
    if (low) { affected.push(i); affectedF.push(nu); }
    const x = c2T * nu;
    const om = -Math.expm1(-x); // 1 − e^{−x}
    const eMode = (x * (1 - om)) / om; // E/kT = x/(eˣ − 1)
    const sV = eMode - Math.log(om); // S/R = x/(eˣ − 1) − ln(1 − e^{−x})
    let sQ = sV;
    if (treatment === "grimme" || wantPerMode) {
      const n2 = nu * nu;
      const w = 1 / (1 + cut4 / (n2 * n2)); // 1/(1 + (ω₀/ν̃)^4)
      const mu = MU_PREFACTOR / nu; // h/(8π²ν)
      const muP = (mu * GRIMME_B_AV) / (mu + GRIMME_B_AV);
      const sR = 0.5 + 0.5 * Math.log(grimmeG * muP); // ½ + ln √(8π³μ'kT/h²)
      sQ = w * sV + (1 - w) * sR;
    }
    if (treatment === "truhlar" && low) {
      eVibKT += eCutKT;
      sVibR += sCutR;
    } else {
      eVibKT += eMode;
      sVibR += treatment === "grimme" ? sQ : sV;
    }
    if (wantPerMode) {
      pmNone[i] = sV * R_GAS;
      pmGrimme[i] = sQ * R_GAS;
      pmTruhlar[i] = (low ? sCutR : sV) * R_GAS;
    }
  }
  const zpe = (0.5 * zpeCm1) / HARTREE_TO_CM1; // ½ Σ h c ν̃
  const eVib = eVibKT * kT_Eh;

  const sElR = Math.log(mult);
  const R = R_GAS;
  const thermalEnergy = eTrans + eRot + eVib + kT_Eh; // + kT: H = U + PV for one ideal-gas particle
  const enthalpyCorrection = zpe + thermalEnergy;
  const entropy = R * (sTransR + sRotR + sVibR + sElR);
  const gibbsCorrection = enthalpyCorrection - (T * entropy) / (E_H * N_A);

  // Extreme but finite inputs (T = 1e-300 K, P = 1e300 Pa) overflow the formulas: refuse rather than answer ±Infinity or NaN.
  if (![zpe, thermalEnergy, entropy, gibbsCorrection].every(Number.isFinite)) {
    throw new ThermoInputError("temperatureK", `The model gives no finite result at T = ${T} K and P = ${P} Pa with these frequencies; check the temperature, pressure and frequencies.`);
  }

  const perMode: ThermoResult["perMode"] = wantPerMode
    ? { frequenciesCm1: Array.from(real.subarray(0, nReal)), entropy: { none: pmNone, grimme: pmGrimme, truhlar: pmTruhlar } }
    : null;
  if (treatment === "none" && affected.length > 0) warnings.push(`${affected.length} real mode(s) below ${cutoff} cm⁻¹ with no low-frequency treatment.`);

  const description =
    treatment === "grimme"
      ? `Grimme quasi-RRHO entropy (Chem. Eur. J. 2012, 18, 9955): ω₀ = ${cutoff} cm⁻¹, α = 4, B_av = 1e-44 kg m²; enthalpy harmonic.`
      : treatment === "truhlar"
        ? `Truhlar (J. Phys. Chem. B 2011, 115, 14556): ${affected.length} mode(s) below ${cutoff} cm⁻¹ raised to ${cutoff} cm⁻¹ for entropy and thermal energy; ZPE from the computed frequencies.`
        : "Harmonic oscillator for every real mode (no low-frequency treatment).";

  return {
    temperatureK: T,
    pressurePa: P,
    units: { energy: "hartree", entropy: "J/(mol K)" },
    zpe,
    thermalEnergy,
    enthalpyCorrection,
    entropy,
    gibbsCorrection,
    contributions: {
      translational: { entropy: R * sTransR, energy: eTrans },
      rotational: { entropy: R * sRotR, energy: eRot },
      vibrational: { entropy: R * sVibR, energy: eVib },
      electronic: { entropy: R * sElR, energy: 0 },
    },
    imaginaryFrequencies: imaginary,
    linear,
    atom,
    principalMoments: moments,
    rotationalTemperaturesK: rotTemps,
    symmetryNumber: sigma,
    multiplicity: mult,
    frequencyScale: scale,
    masses: massModel,
    molecularMass: M,
    lowFrequency: { treatment, cutoffCm1: cutoff, affectedModes: affected, affectedFrequenciesCm1: affectedF, description },
    perMode,
    warnings,
  };
}

function requireSymmetryNumber(v: unknown): number {
  const s = requirePositive(v, "symmetryNumber");
  if (s < 1 || !Number.isInteger(s)) throw new ThermoInputError("symmetryNumber", `symmetryNumber must be a whole number ≥ 1 (got ${s}).`);
  return s;
}
