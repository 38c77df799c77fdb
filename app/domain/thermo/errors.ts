/**
 * Errors raised by the thermochemistry engine.
 *
 * Every function of the engine rejects impossible input (a temperature ≤ 0, NaN, a symmetry number < 1,
 * a multiplicity the electron count forbids, ...) by throwing a ThermoInputError that names the offending
 * field, so that the API can answer 400/422 with `details: [{field, message}]`.
 */
export class ThermoInputError extends Error {
  /** The input field at fault, in the caller's vocabulary (e.g. "temperatureK", "frequenciesCm1[3]"). */
  readonly field: string;
  constructor(field: string, message: string) {
    super(message);
    this.name = "ThermoInputError";
    this.field = field;
  }
}

/** Throws unless `value` is a finite number; returns it typed as number. */
export function requireFinite(value: unknown, field: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new ThermoInputError(field, `${field} must be a finite number (got ${describe(value)}).`);
  }
  return value;
}

/** Throws unless `value` is a finite number > 0. */
export function requirePositive(value: unknown, field: string): number {
  const v = requireFinite(value, field);
  if (v <= 0) throw new ThermoInputError(field, `${field} must be greater than 0 (got ${v}).`);
  return v;
}

/** Throws unless `value` is an integer ≥ min. */
export function requireInteger(value: unknown, field: string, min: number): number {
  const v = requireFinite(value, field);
  if (!Number.isInteger(v) || v < min) {
    throw new ThermoInputError(field, `${field} must be a whole number ≥ ${min} (got ${v}).`);
  }
  return v;
}

/** Temperatures in kelvin: finite and > 0. */
export function requireTemperature(value: unknown, field = "temperatureK"): number {
  const v = requireFinite(value, field);
  if (v <= 0) throw new ThermoInputError(field, `${field} must be above 0 K (got ${v}).`);
  return v;
}

export function describe(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (typeof value === "string") return JSON.stringify(value);
  if (value === null) return "null";
  if (value === undefined) return "nothing";
  return typeof value;
}
