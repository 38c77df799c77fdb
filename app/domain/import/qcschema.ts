/**
 * QCSchema results (MolSSI's open standard, https://molssi-qc-schema.readthedocs.io): a single result
 * object, an array of them, or JSON lines (one object per line). Read per entry:
 *
 *  - `schema_name`: "qcschema_output" (or the older "qc_schema_output"); anything else is refused;
 *  - `success`: false is refused (a failed job's energy is not a result);
 *  - level: `model.method` and `model.basis`, canonicalised later like any typed level (a method written
 *    `B3LYP-D3(BJ)` is method B3LYP with dispersion D3(BJ)); an empty or missing basis is accepted only
 *    for a method that carries its own ("3c" composites such as r2SCAN-3c, semiempirical methods such as
 *    GFN2-xTB or PM7), stored with the basis "built-in"; any other method without a basis is refused;
 *  - species: `molecule.symbols`, `molecule.geometry` (bohr, flat [x1,y1,z1,...] or nested [[x,y,z],...];
 *    converted to Å with the engine's CODATA Bohr radius), `molecule.molecular_charge` (default 0),
 *    `molecule.molecular_multiplicity` (default 1); ghost atoms (`molecule.real` false, an array of
 *    booleans parallel to the symbols) are left out of the formula and the stored geometry; label = `molecule.name` when present, else the
 *    formula in Hill order;
 *  - energy: `return_result` when `driver` is "energy", else `properties.return_energy` (hartree);
 *  - frequencies (Thermotally's documented place, the schema itself has none): `extras.frequencies_cm1`,
 *    an array of harmonic wavenumbers in cm⁻¹, imaginary modes negative.
 */
import { BOHR_TO_ANGSTROM, BUILT_IN_BASIS, hillFormula, methodCarriesBasis, normaliseSymbol, type Vec3 } from "../thermo";
import { countsOfSymbols, xyzText } from "./geometry-text";
import type { ImportProblem, ImportRow, ParsedImport } from "./types";

export const QCSCHEMA_NAMES = ["qcschema_output", "qc_schema_output"];

type Json = Record<string, unknown>;
const isObject = (v: unknown): v is Json => typeof v === "object" && v !== null && !Array.isArray(v);

export function looksLikeQcschema(text: string): boolean {
  return /"schema_name"\s*:\s*"qc_?schema_/.test(text.slice(0, 20000)) || /"schema_name"/.test(text.slice(0, 2000));
}

function entriesOf(text: string): { entries: { value: unknown; row: number }[]; problems: ImportProblem[] } {
  const t = text.replace(/^\uFEFF/, "").trim();
  try {
    const v = JSON.parse(t);
    if (Array.isArray(v)) return { entries: v.map((value, i) => ({ value, row: i + 1 })), problems: [] };
    return { entries: [{ value: v, row: 1 }], problems: [] };
  } catch {
    // JSON lines: one object per line.
  }
  const entries: { value: unknown; row: number }[] = [];
  const problems: ImportProblem[] = [];
  t.split(/\r\n|\r|\n/).forEach((line, i) => {
    if (line.trim() === "") return;
    try {
      entries.push({ value: JSON.parse(line), row: i + 1 });
    } catch (e) {
      problems.push({ row: i + 1, column: "", message: `Line ${i + 1} is not valid JSON (${(e as Error).message})` });
    }
  });
  return { entries, problems };
}

function readGeometry(raw: unknown, n: number): Vec3[] | string {
  if (!Array.isArray(raw)) return "molecule.geometry must be an array of coordinates in bohr";
  const flat: unknown[] = raw.length && Array.isArray(raw[0]) ? (raw as unknown[][]).flat() : raw;
  if (flat.length !== 3 * n) return `molecule.geometry holds ${flat.length} numbers; ${n} atoms need ${3 * n}`;
  if (!flat.every((x) => typeof x === "number" && Number.isFinite(x))) return "molecule.geometry must hold numbers only";
  const out: Vec3[] = [];
  for (let i = 0; i < n; i++) {
    out.push([0, 1, 2].map((k) => (flat[3 * i + k] as number) * BOHR_TO_ANGSTROM) as Vec3);
  }
  return out;
}

export function parseQcschema(text: string, fileName = "results.json"): ParsedImport {
  const { entries, problems } = entriesOf(text);
  const rows: ImportRow[] = [];
  if (!entries.length && !problems.length) problems.push({ row: 1, column: "", message: "The file holds no QCSchema result" });
  for (const { value, row } of entries) {
    const bad = (column: string, message: string) => problems.push({ row, column, message });
    const before = problems.length;
    if (!isObject(value)) {
      bad("", "An entry must be a JSON object (one QCSchema result)");
      continue;
    }
    if (!QCSCHEMA_NAMES.includes(String(value.schema_name))) {
      bad("schema_name", `schema_name is ${JSON.stringify(value.schema_name ?? null)}; a QCSchema result says "qcschema_output"`);
    }
    if (value.success === false) bad("success", "The result says success: false; a failed calculation is not imported");
    const model = isObject(value.model) ? value.model : null;
    const method = typeof model?.method === "string" && model.method.trim() ? model.method.trim() : null;
    const givenBasis = typeof model?.basis === "string" && model.basis.trim() ? model.basis.trim() : null;
    const basisBuiltIn = !givenBasis && !!method && methodCarriesBasis(method);
    const basis = givenBasis ?? (basisBuiltIn ? BUILT_IN_BASIS : null);
    if (!method) bad("model.method", "Missing level: model.method is not given");
    else if (!basis) {
      bad("model.basis", `Missing level: model.basis is not given, and ${method} needs a basis set (only "3c" composites such as r2SCAN-3c and semiempirical methods such as GFN2-xTB carry their own)`);
    }
    const mol = isObject(value.molecule) ? value.molecule : null;
    if (!mol) {
      bad("molecule", "molecule is not given");
      continue;
    }
    const symbolsRaw = mol.symbols;
    let symbols: string[] = [];
    if (!Array.isArray(symbolsRaw) || symbolsRaw.length === 0) bad("molecule.symbols", "molecule.symbols must be a non-empty array of element symbols");
    else {
      symbolsRaw.forEach((s, i) => {
        const sym = typeof s === "string" ? normaliseSymbol(s) : null;
        if (!sym) bad(`molecule.symbols[${i}]`, `Unknown element ${JSON.stringify(s)}`);
        else symbols.push(sym);
      });
    }
    const allCoords = symbols.length ? readGeometry(mol.geometry, symbols.length) : [];
    if (typeof allCoords === "string") bad("molecule.geometry", allCoords);
    // Ghost atoms carry basis functions but no nucleus or electrons: not part of the species.
    let real: boolean[] | null = null;
    if (mol.real !== undefined && mol.real !== null) {
      if (!Array.isArray(mol.real) || !mol.real.every((x) => typeof x === "boolean")) bad("molecule.real", "molecule.real must be an array of true/false, one per symbol");
      else if (Array.isArray(symbolsRaw) && mol.real.length !== symbolsRaw.length) bad("molecule.real", `molecule.real has ${mol.real.length} entries for ${symbolsRaw.length} symbols`);
      else if (!mol.real.some((x) => x)) bad("molecule.real", "Every atom is a ghost (molecule.real all false); nothing is left to import");
      else real = mol.real as boolean[];
    }
    const ghosts = real ? real.filter((x) => !x).length : 0;
    const keep = (_: unknown, i: number) => !real || real[i] === true;
    const coords = typeof allCoords === "string" ? allCoords : allCoords.filter(keep);
    symbols = symbols.filter(keep);
    const charge = mol.molecular_charge ?? 0;
    const multiplicity = mol.molecular_multiplicity ?? 1;
    if (typeof charge !== "number" || !Number.isInteger(charge)) bad("molecule.molecular_charge", "molecular_charge must be a whole number");
    if (typeof multiplicity !== "number" || !Number.isInteger(multiplicity) || multiplicity < 1) {
      bad("molecule.molecular_multiplicity", "molecular_multiplicity must be a whole number ≥ 1");
    }
    const props = isObject(value.properties) ? value.properties : {};
    let energy: unknown = value.driver === "energy" ? value.return_result : undefined;
    let energyColumn = "return_result";
    if (energy === undefined || energy === null) {
      energy = props.return_energy;
      energyColumn = "properties.return_energy";
    }
    if (typeof energy !== "number" || !Number.isFinite(energy)) {
      bad(energyColumn, "No energy: give return_result (driver \"energy\") or properties.return_energy in hartree");
    }
    const extras = isObject(value.extras) ? value.extras : {};
    let frequencies: number[] | null = null;
    if (extras.frequencies_cm1 !== undefined) {
      const f = extras.frequencies_cm1;
      if (!Array.isArray(f) || !f.every((x) => typeof x === "number" && Number.isFinite(x))) bad("extras.frequencies_cm1", "extras.frequencies_cm1 must be an array of numbers (cm-1)");
      else frequencies = f as number[];
    }
    if (problems.length > before) continue;
    const formula = hillFormula(countsOfSymbols(symbols));
    const label = typeof mol.name === "string" && mol.name.trim() ? mol.name.trim() : formula;
    const provenance = isObject(value.provenance) ? value.provenance : {};
    const creator = typeof provenance.creator === "string" ? ` (${provenance.creator}${typeof provenance.version === "string" ? ` ${provenance.version}` : ""})` : "";
    const notes = [
      ghosts ? `${ghosts} ghost atom${ghosts === 1 ? "" : "s"} left out of formula and geometry` : "",
      basisBuiltIn ? `no basis given: ${method} carries its own` : "",
    ].filter(Boolean);
    rows.push({
      row,
      species: {
        label,
        formula,
        smiles: null,
        charge: charge as number,
        multiplicity: multiplicity as number,
        kind: null,
        geometryXyz: xyzText({ symbols, coordinates: coords as Vec3[] }, label),
      },
      conformer: null,
      level: { method: method!, basis: basis!, dispersion: null, solvation: null },
      calculation: {
        // A JSON number's shortest round-trip text: every digit the file gave.
        electronicEnergyHartree: String(energy),
        frequencies,
        thermal: null,
        converged: true,
        sourceNote: `QCSchema ${fileName} entry ${row}${creator}${notes.length ? `; ${notes.join("; ")}` : ""}`,
      },
    });
  }
  return {
    format: "qcschema",
    rows,
    problems,
    columns: {
      species: "molecule.name", formula: "molecule.symbols", charge: "molecule.molecular_charge",
      multiplicity: "molecule.molecular_multiplicity", geometry: "molecule.geometry", level: "model", method: "model.method",
      basis: "model.basis", electronicEnergy: "properties.return_energy", frequencies: "extras.frequencies_cm1",
    },
  };
}
