/** Axis arithmetic shared by the app's drawings (energy profile, per-mode entropy chart). */

/** The round step (1, 2 or 5 × 10ⁿ) at or above `raw`. */
export function niceStep(raw: number): number {
  const mag = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
}

/** Decimals that show a tick step without trailing noise (0.05 → 2, 20 → 0). */
export function tickDecimals(step: number): number {
  return Math.max(0, -Math.floor(Math.log10(Math.abs(step) || 1)));
}
