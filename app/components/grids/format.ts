import Decimal from "decimal.js";

/**
 * Pure formatters and parsers for grid cells. Stored values are never rounded: these shape what is
 * shown and read what is typed or pasted.
 */

/** An energy in hartree for display, rounded to `decimals` places (the stored text keeps every digit). */
export function formatHartree(text: string | null | undefined, decimals = 6): string {
  if (text === null || text === undefined || text === "") return "";
  try {
    return new Decimal(text.replace(/[dD]/, "e")).toFixed(decimals);
  } catch {
    return text;
  }
}

const DECIMAL_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/;

/** Reads a typed or pasted energy: trims, accepts the Unicode minus and thin spaces; "" means empty. */
export function parseHartreeInput(raw: unknown): { ok: true; value: string | null } | { ok: false; message: string } {
  if (raw === null || raw === undefined) return { ok: true, value: null };
  const text = String(raw).replace(/[\u2212\u2012\u2013]/g, "-").replace(/[\s\u00a0\u2009\u202f]/g, "");
  if (text === "") return { ok: true, value: null };
  if (!DECIMAL_RE.test(text)) return { ok: false, message: `${JSON.stringify(String(raw))} is not a number in hartree` };
  return { ok: true, value: text };
}

/** Charge with its sign (+1, 0, −1). */
export function formatCharge(charge: number | null | undefined): string {
  if (charge === null || charge === undefined) return "";
  return charge > 0 ? `+${charge}` : charge < 0 ? `−${Math.abs(charge)}` : "0";
}

const SPIN_NAMES = ["", "singlet", "doublet", "triplet", "quartet", "quintet", "sextet", "septet"];
export function formatMultiplicity(m: number | null | undefined): string {
  if (!m) return "";
  return SPIN_NAMES[m] ? `${m} (${SPIN_NAMES[m]})` : String(m);
}

/** Whole numbers typed into a cell ("+1", "−2", "3 (triplet)"); null when unreadable. */
export function parseIntCell(raw: unknown): number | null {
  if (typeof raw === "number") return Number.isInteger(raw) ? raw : null;
  if (typeof raw !== "string") return null;
  const m = /^\s*([+\-\u2212]?\d+)/.exec(raw);
  if (!m) return null;
  return Number(m[1]!.replace("\u2212", "-"));
}

export function formatKind(kind: string | null | undefined): string {
  return kind === "transition-state" ? "transition state" : kind === "minimum" ? "minimum" : "";
}
export function parseKind(raw: unknown): "minimum" | "transition-state" | null {
  const t = String(raw ?? "").trim().toLowerCase();
  if (["ts", "transition state", "transition-state", "saddle"].includes(t)) return "transition-state";
  if (["min", "minimum", "intermediate"].includes(t)) return "minimum";
  return null;
}

/** Imaginary-mode count for the species grid: "—" without frequencies. */
export function formatImaginary(n: number | null | undefined): string {
  return n === null || n === undefined ? "—" : String(n);
}

/** A block copied from a spreadsheet: rows by line, cells by tab; a final empty line is dropped. */
export function parseTsvBlock(text: string): string[][] {
  const lines = text.replace(/\r\n?/g, "\n").split("\n");
  while (lines.length && lines[lines.length - 1] === "") lines.pop();
  return lines.map((l) => l.split("\t"));
}

export type PasteCell = { species: number; level: number; electronicEnergy: string | null; row: number; column: number };

/**
 * Places a pasted block on the grid from an anchor cell: block row r goes to grid row anchor.row + r,
 * block column c to level column anchor.column + c. Cells that fall outside the grid are reported.
 */
export function placeBlock(
  block: string[][],
  anchor: { row: number; column: number },
  speciesIds: readonly number[],
  levelIds: readonly number[],
): { cells: PasteCell[]; outside: number } {
  const cells: PasteCell[] = [];
  let outside = 0;
  block.forEach((line, r) =>
    line.forEach((value, c) => {
      const species = speciesIds[anchor.row + r];
      const level = levelIds[anchor.column + c];
      if (species === undefined || level === undefined) {
        if (value.trim() !== "") outside++;
        return;
      }
      const parsed = parseHartreeInput(value);
      cells.push({ species, level, electronicEnergy: parsed.ok ? parsed.value : value, row: r, column: c });
    }),
  );
  return { cells, outside };
}
