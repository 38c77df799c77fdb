/**
 * Chemical formulas: element counts and charge from a formula string or a SMILES, molar mass, electron
 * count, spin-multiplicity rules and Hill notation.
 *
 * Formula grammar (documented for users):
 *  - elements with optional counts, groups in (), [] or {} with optional counts: `Ca(OH)2`, `[Fe(CN)6]3-`;
 *  - hydrates / adducts joined by `·`, `•`, `.` or `*`, each part with an optional leading multiplier: `CuSO4·5H2O`;
 *  - a charge at the end: `NH4+`, `SO4--`, `SO4^2-`, `SO4 2-`, `Fe+3`, `Fe³⁺`, `[Fe(CN)6]3-`.
 *    Digits written directly before a bare sign are ATOM COUNTS (`NH4+` is NH4 with charge +1, so `Fe3+`
 *    reads as Fe3 with +1): write `Fe^3+`, `Fe+3`, `Fe 3+` or `[Fe]3+` for iron(III). After a closing
 *    square bracket the digits belong to the charge (`[Fe(CN)6]3-`, coordination-chemistry convention).
 */
import { Molecule } from "openchemlib";
import { ELEMENTS, element } from "./elements";
import { ThermoInputError } from "./errors";

export type ElementCounts = Record<string, number>;
export interface ParsedFormula {
  counts: ElementCounts;
  charge: number;
}

const SUB = "₀₁₂₃₄₅₆₇₈₉";
const SUP = "⁰¹²³⁴⁵⁶⁷⁸⁹";

function extractCharge(text: string): { body: string; charge: number } {
  let s = text.trim().replace(/[₀-₉]/g, (c) => String(SUB.indexOf(c)));
  // Superscript charges: Fe³⁺, SO₄²⁻
  let m = /([⁰¹²³⁴⁵⁶⁷⁸⁹]*)([⁺⁻])$/.exec(s);
  if (m) {
    const n = m[1] ? Number([...m[1]].map((c) => SUP.indexOf(c)).join("")) : 1;
    return { body: s.slice(0, m.index), charge: m[2] === "⁺" ? n : -n };
  }
  s = s.replace(/−/g, "-");
  const signed = (sign: string, digits: string) => (sign === "+" ? 1 : -1) * (digits ? Number(digits) : 1);
  if ((m = /\^\s*(\d*)\s*([+-])$/.exec(s))) return { body: s.slice(0, m.index), charge: signed(m[2]!, m[1]!) };
  if ((m = /\^\s*([+-])(\d*)$/.exec(s))) return { body: s.slice(0, m.index), charge: signed(m[1]!, m[2]!) };
  if ((m = /\](\d*)([+-])$/.exec(s))) return { body: s.slice(0, m.index + 1), charge: signed(m[2]!, m[1]!) };
  if ((m = /\s+(\d*)([+-])$/.exec(s))) return { body: s.slice(0, m.index), charge: signed(m[2]!, m[1]!) };
  if ((m = /([+-])(\d+)$/.exec(s))) return { body: s.slice(0, m.index), charge: signed(m[1]!, m[2]!) };
  if ((m = /(\++|-+)$/.exec(s))) return { body: s.slice(0, m.index), charge: (m[1]![0] === "+" ? 1 : -1) * m[1]!.length };
  return { body: s, charge: 0 };
}

/** Parses a formula string into element counts and charge (grammar above). */
export function parseFormula(text: string, field = "formula"): ParsedFormula {
  if (typeof text !== "string" || text.trim() === "") throw new ThermoInputError(field, `${field} must be non-empty text like "C6H6" or "CuSO4·5H2O".`);
  const { body, charge } = extractCharge(text);
  const src = body.replace(/\s+/g, "");
  if (src === "") throw new ThermoInputError(field, `${field} ${JSON.stringify(text)} has a charge but no elements.`);
  let pos = 0;
  const fail = (msg: string): never => {
    throw new ThermoInputError(field, `Cannot read formula ${JSON.stringify(text)}: ${msg} at position ${pos + 1}.`);
  };
  const readInt = (): number | null => {
    const m = /^\d+/.exec(src.slice(pos));
    if (!m) return null;
    pos += m[0].length;
    return Number(m[0]);
  };
  const CLOSE: Record<string, string> = { "(": ")", "[": "]", "{": "}" };
  const readGroup = (closer: string | null): ElementCounts => {
    const counts: ElementCounts = {};
    while (pos < src.length) {
      const ch = src[pos]!;
      if (closer && ch === closer) return counts;
      if (ch in CLOSE) {
        pos++;
        const inner = readGroup(CLOSE[ch]!);
        if (src[pos] !== CLOSE[ch]) fail(`missing "${CLOSE[ch]}"`);
        pos++;
        const n = readInt() ?? 1;
        if (n === 0) fail("a count of 0");
        for (const [el, c] of Object.entries(inner)) counts[el] = (counts[el] ?? 0) + c * n;
        continue;
      }
      const m = /^[A-Z][a-z]?/.exec(src.slice(pos));
      if (!m) {
        if (/[·•.*⋅]/.test(ch) && !closer) return counts;
        fail(/[)\]}]/.test(ch) ? `unmatched "${ch}"` : `unexpected "${ch}"`);
      }
      let sym = m![0];
      // A lower-case letter always belongs to the symbol ("Co" is cobalt, "CO" carbon monoxide).
      if (!ELEMENTS.has(sym)) fail(`unknown element "${sym}"`);
      pos += sym.length;
      const n = readInt() ?? 1;
      if (n === 0) fail("a count of 0");
      counts[sym] = (counts[sym] ?? 0) + n;
    }
    if (closer) fail(`missing "${closer}"`);
    return counts;
  };
  const total: ElementCounts = {};
  while (pos < src.length) {
    const mult = readInt() ?? 1;
    if (mult === 0) fail("a multiplier of 0");
    const part = readGroup(null);
    if (Object.keys(part).length === 0) fail("an empty part");
    for (const [el, c] of Object.entries(part)) total[el] = (total[el] ?? 0) + c * mult;
    if (pos < src.length) {
      if (!/[·•.*⋅]/.test(src[pos]!)) fail(`unexpected "${src[pos]}"`);
      pos++;
      if (pos >= src.length) fail("nothing after the separator");
    }
  }
  return { counts: total, charge };
}

/** Element counts and net charge of a SMILES, via openchemlib (implicit hydrogens included). */
export function formulaFromSmiles(smiles: string, field = "smiles"): ParsedFormula {
  if (typeof smiles !== "string" || smiles.trim() === "") throw new ThermoInputError(field, `${field} must be non-empty text.`);
  let mol: Molecule;
  try {
    mol = Molecule.fromSmiles(smiles.trim());
  } catch (e) {
    throw new ThermoInputError(field, `Cannot read SMILES ${JSON.stringify(smiles)}: ${(e as Error).message}`);
  }
  if (mol.getAllAtoms() === 0) throw new ThermoInputError(field, `SMILES ${JSON.stringify(smiles)} has no atoms.`);
  let charge = 0;
  for (let i = 0; i < mol.getAllAtoms(); i++) charge += mol.getAtomCharge(i);
  const f = mol.getMolecularFormula().formula;
  const { counts } = parseFormula(f, field);
  return { counts, charge };
}

/** Molar mass in g/mol from standard atomic weights (or most-abundant isotope masses). */
export function molarMass(counts: ElementCounts, masses: "average" | "isotopic" = "average"): number {
  let m = 0;
  for (const [sym, n] of Object.entries(counts)) {
    const el = element(sym);
    if (!el) throw new ThermoInputError("formula", `Unknown element "${sym}".`);
    m += n * (masses === "average" ? el.atomicWeight : el.isotopicMass);
  }
  return m;
}

/** Number of electrons: Σ Z·n − charge. */
export function electronCount(counts: ElementCounts, charge = 0): number {
  if (!Number.isInteger(charge)) throw new ThermoInputError("charge", `charge must be a whole number (got ${charge}).`);
  let n = 0;
  for (const [sym, c] of Object.entries(counts)) {
    const el = element(sym);
    if (!el) throw new ThermoInputError("formula", `Unknown element "${sym}".`);
    if (!Number.isInteger(c) || c < 0) throw new ThermoInputError("formula", `Count of ${sym} must be a whole number ≥ 0.`);
    n += el.z * c;
  }
  const e = n - charge;
  if (e < 0) throw new ThermoInputError("charge", `A charge of ${charge} leaves ${e} electrons.`);
  return e;
}

/**
 * Whether spin multiplicity 2S+1 is possible for this electron count: the number of unpaired electrons
 * (multiplicity − 1) must not exceed the electron count and must have the same parity (even electrons →
 * odd multiplicity: singlet, triplet...; odd electrons → doublet, quartet...).
 */
export function isMultiplicityPossible(electrons: number, multiplicity: number): boolean {
  if (!Number.isInteger(electrons) || electrons < 0) throw new ThermoInputError("electrons", `electron count must be a whole number ≥ 0 (got ${electrons}).`);
  if (!Number.isInteger(multiplicity) || multiplicity < 1) return false;
  const unpaired = multiplicity - 1;
  return unpaired <= electrons && (electrons - unpaired) % 2 === 0;
}

/** Throws a ThermoInputError naming `multiplicity` when the electron count forbids it. */
export function assertMultiplicity(electrons: number, multiplicity: number, field = "multiplicity"): void {
  if (!isMultiplicityPossible(electrons, multiplicity)) {
    const parity = electrons % 2 === 0 ? "an even number of electrons needs an odd multiplicity (1, 3, 5 ...)" : "an odd number of electrons needs an even multiplicity (2, 4, 6 ...)";
    throw new ThermoInputError(field, `Multiplicity ${multiplicity} is impossible with ${electrons} electrons: ${parity}, at most ${electrons + 1}.`);
  }
}

/** Hill notation: C first, H second, then alphabetical; without C, all alphabetical. A charge is appended as `^2-` (parseFormula reads it back). */
export function hillFormula(counts: ElementCounts, charge = 0): string {
  const syms = Object.keys(counts).filter((s) => counts[s]! > 0);
  const hasC = syms.includes("C");
  syms.sort((a, b) => {
    if (hasC) {
      const rank = (s: string) => (s === "C" ? 0 : s === "H" ? 1 : 2);
      if (rank(a) !== rank(b)) return rank(a) - rank(b);
    }
    return a < b ? -1 : a > b ? 1 : 0;
  });
  const body = syms.map((s) => (counts[s] === 1 ? s : `${s}${counts[s]}`)).join("");
  if (!charge) return body;
  const mag = Math.abs(charge);
  return `${body}^${mag === 1 ? "" : mag}${charge > 0 ? "+" : "-"}`;
}
