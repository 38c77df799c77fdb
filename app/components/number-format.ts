/**
 * Numbers shown to people, rounded for reading (stored and exported values keep every digit): one table
 * of decimals per energy unit and one way of writing a signed value, used by the grids, the drawings and
 * the calculator alike.
 */
export const ENERGY_DECIMALS: Readonly<Record<string, number>> = { "kcal/mol": 2, "kJ/mol": 2, eV: 3, "cm-1": 1, hartree: 6 };

/** Fixed decimals with a real minus sign; a value that rounds to zero loses its sign ("−0.00" → "0.00"). */
export function formatSigned(value: number, decimals: number): string {
  const t = value.toFixed(decimals);
  return (/^-0(\.0+)?$/.test(t) ? t.slice(1) : t).replace(/^-/, "−");
}

/** An energy already in `unit`, rounded for reading; "—" when not computed. */
export function formatEnergyValue(value: number | null | undefined, unit: string): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return formatSigned(value, ENERGY_DECIMALS[unit] ?? 2);
}
