/**
 * Energies with their unit in the type, one conversion table, a unit parser, and decimal sums of
 * absolute energies.
 *
 * convert-units (v2) covers temperature and pressure (Pa, kPa, bar, torr, ...), which we use below.
 * It has no standard atmosphere, no calorie and no molar or per-particle energies (kcal/mol, hartree,
 * cm⁻¹ per molecule ...), so molar/per-particle energies live in OUR table, built from the CODATA 2018
 * constants of ./constants; one table keeps every factor traceable to one constant.
 */
import convert from "convert-units";
import Decimal from "decimal.js";
import {
  ATM_PA, CAL, ELECTRON_VOLT, HARTREE_TO_J_PER_MOL, N_A, H_PLANCK, C_LIGHT,
} from "./constants";
import { ThermoInputError, describe, requireFinite } from "./errors";

export const ENERGY_UNITS = ["hartree", "kcal/mol", "kJ/mol", "eV", "cm-1", "J/mol"] as const;
export type EnergyUnit = (typeof ENERGY_UNITS)[number];

declare const unitBrand: unique symbol;
/**
 * An energy carrying its unit in the type. Built only through `energy()` (the brand cannot be typed
 * by hand), so `addEnergies(kcal, hartree)` does not compile. eV, cm⁻¹ and hartree are per particle;
 * they are interconverted with molar units through N_A.
 */
export type Quantity<U extends EnergyUnit = EnergyUnit> = {
  readonly value: number;
  readonly unit: U;
  readonly [unitBrand]: U;
};

/** J/mol per unit: the one conversion table. */
export const J_PER_MOL: Readonly<Record<EnergyUnit, number>> = {
  hartree: HARTREE_TO_J_PER_MOL,
  "kcal/mol": 1000 * CAL,
  "kJ/mol": 1000,
  eV: ELECTRON_VOLT.value * N_A,
  "cm-1": H_PLANCK * C_LIGHT * 100 * N_A,
  "J/mol": 1,
};

function isEnergyUnit(u: unknown): u is EnergyUnit {
  return typeof u === "string" && (ENERGY_UNITS as readonly string[]).includes(u);
}

/** Makes a Quantity; rejects NaN/Infinity and unknown units. */
export function energy<U extends EnergyUnit>(value: number, unit: U, field = "energy"): Quantity<U> {
  requireFinite(value, field);
  if (!isEnergyUnit(unit)) throw new ThermoInputError(`${field}.unit`, `Unknown energy unit ${describe(unit)}.`);
  return { value, unit } as Quantity<U>;
}

export const hartree = (v: number): Quantity<"hartree"> => energy(v, "hartree");
export const kcalPerMol = (v: number): Quantity<"kcal/mol"> => energy(v, "kcal/mol");
export const kJPerMol = (v: number): Quantity<"kJ/mol"> => energy(v, "kJ/mol");

/** Runtime guard for values that arrive untyped (JSON). */
export function assertQuantity(q: unknown, field = "energy"): Quantity {
  if (typeof q !== "object" || q === null) throw new ThermoInputError(field, `${field} must be an energy with a unit.`);
  const { value, unit } = q as { value: unknown; unit: unknown };
  if (!isEnergyUnit(unit)) {
    throw new ThermoInputError(`${field}.unit`, `${field} has unit ${describe(unit)}; expected one of ${ENERGY_UNITS.join(", ")}.`);
  }
  return energy(requireFinite(value, `${field}.value`), unit, field);
}

/** Converts through J/mol. */
export function convertEnergy<U extends EnergyUnit, V extends EnergyUnit>(q: Quantity<U>, to: V): Quantity<V> {
  const checked = assertQuantity(q);
  if (!isEnergyUnit(to)) throw new ThermoInputError("unit", `Unknown target unit ${describe(to)}.`);
  if (checked.unit === to) return checked as unknown as Quantity<V>;
  return energy((checked.value * J_PER_MOL[checked.unit]) / J_PER_MOL[to], to);
}

/** Value of `q` expressed in `unit`, as a plain number. */
export function energyIn(q: Quantity, unit: EnergyUnit): number {
  return convertEnergy(q, unit).value;
}

/** a + b, same unit enforced at compile time (NoInfer: the unit is fixed by `a`). */
export function addEnergies<U extends EnergyUnit>(a: Quantity<U>, b: Quantity<NoInfer<U>>): Quantity<U> {
  assertSameUnit(a, b);
  return energy(a.value + b.value, a.unit);
}
export function subtractEnergies<U extends EnergyUnit>(a: Quantity<U>, b: Quantity<NoInfer<U>>): Quantity<U> {
  assertSameUnit(a, b);
  return energy(a.value - b.value, a.unit);
}
export function scaleEnergy<U extends EnergyUnit>(a: Quantity<U>, factor: number): Quantity<U> {
  return energy(a.value * requireFinite(factor, "factor"), a.unit);
}
function assertSameUnit(a: Quantity, b: Quantity): void {
  assertQuantity(a, "a");
  assertQuantity(b, "b");
  if (a.unit !== b.unit) throw new ThermoInputError("unit", `Cannot combine ${a.unit} with ${b.unit}; convert first.`);
}

// ---- unit parser ----
const UNIT_SPELLINGS: Record<string, EnergyUnit> = {
  "kcal/mol": "kcal/mol", "kcalmol-1": "kcal/mol", "kcalmol^-1": "kcal/mol", "kcal·mol-1": "kcal/mol", "kcal.mol-1": "kcal/mol", "kcalmol⁻¹": "kcal/mol",
  "kj/mol": "kJ/mol", "kjmol-1": "kJ/mol", "kjmol^-1": "kJ/mol", "kj·mol-1": "kJ/mol", "kj.mol-1": "kJ/mol", "kjmol⁻¹": "kJ/mol",
  "j/mol": "J/mol", "jmol-1": "J/mol", "jmol^-1": "J/mol",
  ev: "eV", "electronvolt": "eV", "electronvolts": "eV",
  eh: "hartree", hartree: "hartree", hartrees: "hartree", au: "hartree", "a.u.": "hartree", ha: "hartree",
  "cm-1": "cm-1", "cm^-1": "cm-1", "cm⁻¹": "cm-1", "1/cm": "cm-1", wavenumber: "cm-1", wavenumbers: "cm-1",
};
const ACCEPTED_SPELLINGS = "kcal/mol, kcal mol-1, kcal mol^-1, kJ/mol, kJ mol-1, J/mol, eV, Eh, hartree, au, cm-1, cm^-1";

/** Parses the spellings people type; case and inner spaces ignored except the eV/Eh letters. */
export function parseEnergyUnit(text: string, field = "unit"): EnergyUnit {
  if (typeof text !== "string") throw new ThermoInputError(field, `${field} must be text; accepted: ${ACCEPTED_SPELLINGS}.`);
  const key = text.trim().toLowerCase().replace(/\s+/g, "");
  const unit = UNIT_SPELLINGS[key];
  if (!unit) {
    throw new ThermoInputError(field, `Unknown energy unit ${JSON.stringify(text)}; accepted: ${ACCEPTED_SPELLINGS}.`);
  }
  return unit;
}

// ---- temperature and pressure (convert-units where it covers them) ----
export type TemperatureUnit = "K" | "C";
export type PressureUnit = "Pa" | "kPa" | "MPa" | "hPa" | "bar" | "torr" | "atm";

export function convertTemperature(value: number, from: TemperatureUnit, to: TemperatureUnit): number {
  requireFinite(value, "temperature");
  if (from !== "K" && from !== "C") throw new ThermoInputError("temperatureUnit", `Unknown temperature unit ${describe(from)}; accepted: K, C.`);
  if (to !== "K" && to !== "C") throw new ThermoInputError("temperatureUnit", `Unknown temperature unit ${describe(to)}; accepted: K, C.`);
  const kelvin = from === "K" ? value : convert(value).from("C").to("K");
  if (kelvin <= 0) throw new ThermoInputError("temperature", `Temperature must be above 0 K (got ${value} ${from}).`);
  return to === "K" ? kelvin : convert(kelvin).from("K").to("C");
}

/** Pressure conversion; the standard atmosphere (absent from convert-units) is handled via 101325 Pa. */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit): number {
  requireFinite(value, "pressure");
  const valid = ["Pa", "kPa", "MPa", "hPa", "bar", "torr", "atm"];
  if (!valid.includes(from)) throw new ThermoInputError("pressureUnit", `Unknown pressure unit ${describe(from)}; accepted: ${valid.join(", ")}.`);
  if (!valid.includes(to)) throw new ThermoInputError("pressureUnit", `Unknown pressure unit ${describe(to)}; accepted: ${valid.join(", ")}.`);
  const pa = from === "atm" ? value * ATM_PA : from === "Pa" ? value : convert(value).from(from).to("Pa");
  if (pa <= 0) throw new ThermoInputError("pressure", `Pressure must be above 0 (got ${value} ${from}).`);
  return to === "atm" ? pa / ATM_PA : to === "Pa" ? pa : convert(pa).from("Pa").to(to);
}

// ---- decimal arithmetic of absolute energies ----
/** 40 significant digits: absolute energies of 1e4 hartree keep 1e-30 resolution. */
export const HDecimal = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_EVEN });
export type HartreeDecimal = Decimal;
export type HartreeInput = string | number | Quantity<"hartree"> | Decimal;

const DECIMAL_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/;

/**
 * An energy given as decimal text in `unit` → hartree as decimal text, in decimal arithmetic through the
 * conversion table. Rounded to 1e-12 hartree, the precision the ledger stores (DECIMAL(24,12)), far below
 * the digits of any molar-energy input.
 */
export function decimalTextToHartree(value: string, unit: EnergyUnit): string {
  const d = new HDecimal(value);
  if (unit === "hartree") return d.toFixed();
  const factor = new HDecimal(J_PER_MOL[unit]).div(J_PER_MOL.hartree);
  return d.times(factor).toDecimalPlaces(12).toFixed();
}

/** Reads an absolute energy in hartree from a decimal string (Fortran D exponents accepted), number or Quantity. */
export function toHartreeDecimal(value: HartreeInput, field = "energyHartree"): Decimal {
  if (Decimal.isDecimal(value)) {
    if (!(value as Decimal).isFinite()) throw new ThermoInputError(field, `${field} must be finite.`);
    return new HDecimal(value as Decimal);
  }
  if (typeof value === "string") {
    const t = value.trim();
    if (!DECIMAL_RE.test(t)) throw new ThermoInputError(field, `${field} must be a decimal number in hartree (got ${JSON.stringify(value)}).`);
    return new HDecimal(t.replace(/[dD]/, "e"));
  }
  if (typeof value === "number") return new HDecimal(requireFinite(value, field));
  if (typeof value === "object" && value !== null && "unit" in value) {
    const q = assertQuantity(value, field);
    if (q.unit !== "hartree") throw new ThermoInputError(`${field}.unit`, `${field} must be in hartree (got ${q.unit}).`);
    return new HDecimal(q.value);
  }
  throw new ThermoInputError(field, `${field} must be a decimal number in hartree (got ${describe(value)}).`);
}

export interface HartreeTerm {
  coefficient: number | string;
  energyHartree: HartreeInput;
}

/** Σ coefficient · energy, exact in decimal (absolute energies arrive as decimal strings). */
export function sumHartree(terms: readonly HartreeTerm[], field = "terms"): Decimal {
  if (!Array.isArray(terms)) throw new ThermoInputError(field, `${field} must be a list.`);
  let sum = new HDecimal(0);
  terms.forEach((t, i) => {
    const c = t?.coefficient;
    if (typeof c === "number") requireFinite(c, `${field}[${i}].coefficient`);
    else if (typeof c !== "string" || !DECIMAL_RE.test(c.trim())) {
      throw new ThermoInputError(`${field}[${i}].coefficient`, `${field}[${i}].coefficient must be a number.`);
    }
    sum = sum.plus(new HDecimal(c).times(toHartreeDecimal(t.energyHartree, `${field}[${i}].energyHartree`)));
  });
  return sum;
}

/** a − b in hartree, exact. */
export function hartreeDifference(a: HartreeInput, b: HartreeInput): Decimal {
  return toHartreeDecimal(a, "a").minus(toHartreeDecimal(b, "b"));
}
