/**
 * Reading numbers as people write them in spreadsheets, without guessing: a Unicode minus (U+2212) is a
 * minus, surrounding spaces are dropped, scientific notation (1.2E-3, 1,2E-3) is read exactly, and the
 * decimal mark is the one the file declared (a `;`-separated file uses `,`; a `,`-separated one `.`).
 * Anything else (thousands separators, the other decimal mark, units typed into the cell) is refused
 * with a message that says what was seen.
 */
export type DecimalMark = "." | ",";

export type NumberRead = { ok: true; text: string; scientific: boolean; significantDigits: number } | { ok: false; message: string };

const MINUS = /[\u2212\u2012\u2013\uFE63\uFF0D]/g;

export function normaliseCell(raw: string): string {
  return raw.replace(/\u00A0/g, " ").trim();
}

/**
 * A decimal number as canonical text with `.` as the mark (exact: no float round trip), or the reason
 * it cannot be read.
 */
export function readDecimal(raw: string, mark: DecimalMark): NumberRead {
  const t = normaliseCell(raw).replace(MINUS, "-");
  if (t === "") return { ok: false, message: "is empty" };
  const other = mark === "." ? "," : ".";
  const pattern = mark === "." ? /^([+-]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?$/ : /^([+-]?)(\d+(?:,\d*)?|,\d+)(?:[eE]([+-]?\d+))?$/;
  const m = pattern.exec(t);
  if (!m) {
    if (t.includes(mark) && t.includes(other)) return { ok: false, message: `${JSON.stringify(raw.trim())} mixes "." and ","; write it without thousands separators` };
    if (t.includes(other) && /^[+-]?[\d.,]+([eE][+-]?\d+)?$/.test(t)) {
      return {
        ok: false,
        message:
          mark === "."
            ? `${JSON.stringify(raw.trim())} uses a decimal comma, but this file separates columns with commas and so uses a decimal point`
            : `${JSON.stringify(raw.trim())} uses a decimal point, but this file separates columns with semicolons and so uses a decimal comma; use one decimal mark throughout`,
      };
    }
    return { ok: false, message: `${JSON.stringify(raw.trim())} is not a number` };
  }
  const sign = m[1] === "-" ? "-" : "";
  const mantissa = m[2]!.replace(",", ".");
  const exponent = m[3];
  const digits = mantissa.replace(".", "").replace(/^0+/, "");
  return {
    ok: true,
    text: `${sign}${mantissa.startsWith(".") ? "0" + mantissa : mantissa}${exponent !== undefined ? `e${exponent}` : ""}`,
    scientific: exponent !== undefined,
    significantDigits: digits.length,
  };
}

/** A whole number (charge, multiplicity), or the reason not. */
export function readInteger(raw: string, mark: DecimalMark): { ok: true; value: number } | { ok: false; message: string } {
  const r = readDecimal(raw, mark);
  if (!r.ok) return r;
  const v = Number(r.text);
  if (!Number.isInteger(v)) return { ok: false, message: `${JSON.stringify(raw.trim())} is not a whole number` };
  return { ok: true, value: v };
}

/** A list of numbers separated by spaces or semicolons (frequencies), each read like readDecimal. */
export function readNumberList(raw: string, mark: DecimalMark): { ok: true; values: number[] } | { ok: false; message: string } {
  const t = normaliseCell(raw);
  if (t === "") return { ok: true, values: [] };
  // With a decimal point, a comma also separates items ("1200, 1300"); with a decimal comma it cannot.
  const parts = t.split(mark === "." ? /[\s;,]+/ : /[\s;]+/).filter((p) => p !== "");
  const values: number[] = [];
  for (const [i, p] of parts.entries()) {
    const r = readDecimal(p, mark);
    if (!r.ok) return { ok: false, message: `item ${i + 1}: ${r.message}` };
    values.push(Number(r.text));
  }
  return { ok: true, values };
}

const TRUE = new Set(["yes", "y", "true", "1", "converged", "ok"]);
const FALSE = new Set(["no", "n", "false", "0", "not converged"]);

export function readBoolean(raw: string): { ok: true; value: boolean } | { ok: false; message: string } {
  const t = normaliseCell(raw).toLowerCase();
  if (TRUE.has(t)) return { ok: true, value: true };
  if (FALSE.has(t)) return { ok: true, value: false };
  return { ok: false, message: `${JSON.stringify(raw.trim())} is neither yes nor no` };
}
