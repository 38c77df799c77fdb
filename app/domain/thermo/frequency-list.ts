import { ThermoInputError } from "./errors";

/**
 * Reads a list of harmonic frequencies (cm⁻¹) as people paste it: one per line, or separated by commas,
 * semicolons, tabs or spaces. A Unicode minus (U+2212) marks an imaginary mode like "-". Anything that is
 * not a number is refused by position, never skipped.
 */
export function parseFrequencyList(text: string, field = "frequencies"): number[] {
  const tokens = text
    .replace(/\u2212/g, "-")
    .split(/[\s,;]+/)
    .filter((t) => t.length > 0);
  return tokens.map((token, i) => {
    if (!/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(token)) {
      throw new ThermoInputError(field, `Frequency ${i + 1} (“${token}”) is not a number in cm⁻¹.`);
    }
    const value = Number(token);
    if (value === 0) throw new ThermoInputError(field, `Frequency ${i + 1} is zero: remove translations and rotations.`);
    return value;
  });
}
