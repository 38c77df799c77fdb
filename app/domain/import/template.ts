/**
 * The project's own import template: one row per calculation, plain headings of our own choosing, the
 * unit of each quantity in its heading, e.g. "Electronic energy (kcal/mol)". CSV and XLSX files are read
 * into a grid of text cells first; this module turns that grid into import rows.
 *
 * Headings are matched without regard to case or repeated spaces; an unknown heading, a unit that does
 * not suit its column, or a column given twice is refused (row 1), since a guessed column would put
 * numbers in the wrong place.
 */
import { decimalTextToHartree, HDecimal, type EnergyUnit, parseEnergyUnit, ThermoInputError } from "../thermo";
import { readBoolean, readDecimal, readInteger, readNumberList, normaliseCell, type DecimalMark } from "./numbers";
import type { ImportField, ImportFormat, ImportProblem, ImportRow, LevelParts, ParsedImport } from "./types";

type ColumnKind = "text" | "integer" | "energy" | "absoluteEnergy" | "list" | "temperature" | "boolean";
interface ColumnSpec {
  field: ImportField;
  heading: string;
  kind: ColumnKind;
  /** Units accepted in the heading; the first is the default when the heading names none. */
  units?: readonly string[];
  help: string;
}

const ENERGY_UNITS_ACCEPTED = ["hartree", "kcal/mol", "kJ/mol"] as const;

export const TEMPLATE_COLUMNS: readonly ColumnSpec[] = [
  { field: "species", heading: "Species", kind: "text", help: "Label of the species, as used in equations (no spaces); a new label creates the species" },
  { field: "formula", heading: "Formula", kind: "text", help: "Molecular formula, e.g. C9H10O (needed for a new species unless SMILES is given)" },
  { field: "smiles", heading: "SMILES", kind: "text", help: "SMILES of the species (optional; the formula is derived from it)" },
  { field: "charge", heading: "Charge", kind: "integer", help: "Net charge (default 0)" },
  { field: "multiplicity", heading: "Multiplicity", kind: "integer", help: "Spin multiplicity 2S+1 (default 1)" },
  { field: "kind", heading: "Kind", kind: "text", help: "minimum or transition state (default minimum)" },
  { field: "conformer", heading: "Conformer", kind: "text", help: "Conformer label (optional; a new label creates the conformer)" },
  { field: "level", heading: "Level", kind: "text", help: "The whole level as one text, e.g. B3LYP-D3(BJ)/def2-TZVP SMD(toluene) (instead of the parts)" },
  { field: "method", heading: "Method", kind: "text", help: "Method, e.g. B3LYP" },
  { field: "basis", heading: "Basis", kind: "text", help: "Basis set, e.g. def2-TZVP" },
  { field: "dispersion", heading: "Dispersion", kind: "text", help: "Dispersion correction, e.g. D3(BJ) (optional)" },
  { field: "solvationModel", heading: "Solvation model", kind: "text", help: "Implicit solvation model, e.g. SMD (optional)" },
  { field: "solvent", heading: "Solvent", kind: "text", help: "Solvent of the solvation model (with the model)" },
  { field: "electronicEnergy", heading: "Electronic energy", kind: "absoluteEnergy", units: ENERGY_UNITS_ACCEPTED, help: "Total electronic energy; hartree unless the heading names kcal/mol or kJ/mol" },
  { field: "frequencies", heading: "Frequencies", kind: "list", units: ["cm-1"], help: "Harmonic frequencies in cm-1 separated by spaces or semicolons; imaginary ones negative" },
  { field: "thermalTemperature", heading: "Thermal temperature", kind: "temperature", units: ["K"], help: "Temperature of the stored thermal corrections" },
  { field: "zpe", heading: "ZPE", kind: "energy", units: ENERGY_UNITS_ACCEPTED, help: "Zero-point energy" },
  { field: "enthalpyCorrection", heading: "Enthalpy correction", kind: "energy", units: ENERGY_UNITS_ACCEPTED, help: "Thermal correction to the enthalpy (includes the ZPE)" },
  { field: "gibbsCorrection", heading: "Gibbs correction", kind: "energy", units: ENERGY_UNITS_ACCEPTED, help: "Thermal correction to the Gibbs free energy (includes the ZPE)" },
  { field: "converged", heading: "Converged", kind: "boolean", help: "yes or no (default yes)" },
  { field: "sourceNote", heading: "Source note", kind: "text", help: "Where the numbers come from (file, job, notebook page)" },
];

const squash = (s: string) => s.toLowerCase().replace(/\s+/g, " ").trim();
const BY_NAME = new Map(TEMPLATE_COLUMNS.map((c) => [squash(c.heading), c]));

/** The heading written with its default unit, e.g. "Electronic energy (hartree)". */
export function headingWithUnit(c: ColumnSpec, unit?: string): string {
  const u = unit ?? c.units?.[0];
  return u ? `${c.heading} (${u})` : c.heading;
}

interface BoundColumn {
  spec: ColumnSpec;
  index: number;
  heading: string;
  unit: string | null;
}

function canonicalUnit(spec: ColumnSpec, unitText: string): string | null {
  if (!spec.units) return null;
  if (spec.kind === "energy" || spec.kind === "absoluteEnergy") {
    try {
      const u: EnergyUnit = parseEnergyUnit(unitText);
      return (spec.units as readonly string[]).includes(u) ? u : null;
    } catch (e) {
      if (e instanceof ThermoInputError) return null;
      throw e;
    }
  }
  const k = unitText.toLowerCase().replace(/\s+/g, "").replace("⁻¹", "-1").replace("^-1", "-1");
  return spec.units.find((u) => u.toLowerCase() === k || (u === "cm-1" && k === "1/cm")) ?? null;
}

function bindHeader(header: string[], problems: ImportProblem[]): BoundColumn[] {
  const bound: BoundColumn[] = [];
  const seen = new Map<ImportField, string>();
  header.forEach((raw, index) => {
    const heading = normaliseCell(raw);
    if (heading === "") return; // an empty heading over an empty column (spreadsheets leave these)
    const m = /^(.*?)\s*\(([^()]*)\)\s*$/.exec(heading);
    const name = squash(m ? m[1]! : heading);
    const spec = BY_NAME.get(name);
    if (!spec) {
      problems.push({ row: 1, column: heading, message: `Unknown column "${heading}"; the template's columns are: ${TEMPLATE_COLUMNS.map((c) => headingWithUnit(c)).join(", ")}` });
      return;
    }
    let unit: string | null = spec.units?.[0] ?? null;
    if (m) {
      if (!spec.units) {
        problems.push({ row: 1, column: heading, message: `The column ${spec.heading} takes no unit` });
        return;
      }
      unit = canonicalUnit(spec, m[2]!);
      if (!unit) {
        problems.push({ row: 1, column: heading, message: `Unknown unit "${m[2]}" for ${spec.heading}; accepted: ${spec.units.join(", ")}` });
        return;
      }
    }
    const dup = seen.get(spec.field);
    if (dup) {
      problems.push({ row: 1, column: heading, message: `The column ${spec.heading} is given twice ("${dup}" and "${heading}")` });
      return;
    }
    seen.set(spec.field, heading);
    bound.push({ spec, index, heading, unit });
  });
  if (!seen.has("species")) problems.push({ row: 1, column: "Species", message: "The file has no Species column" });
  if (!seen.has("level") && !(seen.has("method") && seen.has("basis"))) {
    problems.push({ row: 1, column: "Level", message: "The file names no level: give a Level column, or Method and Basis columns" });
  }
  return bound;
}

/** Rows of text cells (first row = headings) → import rows. `rowOffset` = spreadsheet row of grid[0] minus 1. */
export function rowsFromGrid(grid: string[][], mark: DecimalMark, format: ImportFormat, rowOffset = 0): ParsedImport {
  const problems: ImportProblem[] = [];
  const rows: ImportRow[] = [];
  if (grid.length === 0 || grid[0]!.every((c) => normaliseCell(c) === "")) {
    return { format, rows, problems: [{ row: 1, column: "", message: "The file is empty: the first row must hold the column headings" }], columns: {} };
  }
  const bound = bindHeader(grid[0]!, problems);
  const columns: Partial<Record<ImportField, string>> = {};
  for (const b of bound) columns[b.spec.field] = b.heading;
  if (problems.length) return { format, rows, problems, columns };
  const width = grid[0]!.length;

  for (let r = 1; r < grid.length; r++) {
    const cells = grid[r]!;
    const rowNo = r + 1 + rowOffset;
    if (cells.every((c) => normaliseCell(c) === "")) continue; // blank lines between blocks
    if (cells.length > width && cells.slice(width).some((c) => normaliseCell(c) !== "")) {
      problems.push({ row: rowNo, column: `column ${width + 1}`, message: `This row has ${cells.length} cells but the heading row ${width}; a separator inside a value must be quoted` });
      continue;
    }
    const before = problems.length;
    const v: Partial<Record<ImportField, string>> = {};
    const heading: Partial<Record<ImportField, BoundColumn>> = {};
    for (const b of bound) {
      v[b.spec.field] = normaliseCell(cells[b.index] ?? "");
      heading[b.spec.field] = b;
    }
    const bad = (field: ImportField, message: string) => problems.push({ row: rowNo, column: heading[field]?.heading ?? field, message });
    const text = (field: ImportField) => (v[field] ? v[field]! : null);
    const int = (field: ImportField) => {
      const t = v[field];
      if (!t) return null;
      const r2 = readInteger(t, mark);
      if (!r2.ok) return bad(field, `${heading[field]!.spec.heading} ${r2.message}`), null;
      return r2.value;
    };
    const energy = (field: ImportField, absolute: boolean): string | null => {
      const t = v[field];
      if (!t) return null;
      const r2 = readDecimal(t, mark);
      if (!r2.ok) return bad(field, `${heading[field]!.spec.heading} ${r2.message}`), null;
      if (absolute && r2.scientific && r2.significantDigits < 7) {
        bad(field, `${JSON.stringify(t)} keeps only ${r2.significantDigits} significant digits: a spreadsheet shortened it in scientific notation; format the column as a number with all its decimals and export again`);
        return null;
      }
      return decimalTextToHartree(r2.text, (heading[field]!.unit ?? "hartree") as EnergyUnit);
    };

    const label = text("species");
    if (!label) bad("species", "Give the species label");
    const kindText = text("kind");
    let kind: "minimum" | "transition-state" | null = null;
    if (kindText) {
      const k = kindText.toLowerCase().replace(/[\s_-]+/g, " ");
      if (k === "minimum" || k === "min") kind = "minimum";
      else if (k === "transition state" || k === "ts") kind = "transition-state";
      else bad("kind", `Kind ${JSON.stringify(kindText)} is neither minimum nor transition state`);
    }

    let level: LevelParts | null = null;
    const levelText = text("level");
    const method = text("method");
    const basis = text("basis");
    const dispersion = text("dispersion");
    const model = text("solvationModel");
    const solvent = text("solvent");
    if (levelText && (method || basis)) bad("level", "Give the level either as one text or as method and basis, not both");
    else if (levelText) level = { text: levelText };
    else if (method || basis) {
      if (!method) bad("method", "Give the method with the basis");
      if (!basis) bad("basis", "Give the basis with the method");
      if ((model && !solvent) || (!model && solvent)) bad(model ? "solvent" : "solvationModel", "Give both the solvation model and the solvent, or neither");
      if (method && basis) level = { method, basis, dispersion, solvation: model && solvent ? { model, solvent } : null };
    } else bad(columns.level ? "level" : "method", "Missing level: give the level of theory of this calculation");

    const electronicEnergyHartree = energy("electronicEnergy", true);
    let frequencies: number[] | null = null;
    if (v.frequencies) {
      const fl = readNumberList(v.frequencies, mark);
      if (!fl.ok) bad("frequencies", `Frequencies: ${fl.message}`);
      else frequencies = fl.values;
    }
    const zpe = energy("zpe", false);
    const h = energy("enthalpyCorrection", false);
    const g = energy("gibbsCorrection", false);
    let temperatureK: string | null = null;
    if (v.thermalTemperature) {
      const t = readDecimal(v.thermalTemperature, mark);
      if (!t.ok) bad("thermalTemperature", `Thermal temperature ${t.message}`);
      else if (!(Number(t.text) > 0)) bad("thermalTemperature", "The thermal temperature must be above 0 K");
      else temperatureK = new HDecimal(t.text).toFixed();
    }
    const anyCorrection = !!(v.zpe || v.enthalpyCorrection || v.gibbsCorrection);
    if (anyCorrection && !v.thermalTemperature) bad("thermalTemperature", "Give the temperature at which the thermal corrections were computed");
    if (!anyCorrection && v.thermalTemperature) bad("thermalTemperature", "A thermal temperature without ZPE, enthalpy or Gibbs correction");
    let converged = true;
    if (v.converged) {
      const c = readBoolean(v.converged);
      if (!c.ok) bad("converged", `Converged ${c.message}`);
      else converged = c.value;
    }
    const conformer = text("conformer");
    const charge = int("charge");
    const multiplicity = int("multiplicity");
    if (problems.length > before) continue;
    rows.push({
      row: rowNo,
      species: {
        label: label!,
        formula: text("formula"),
        smiles: text("smiles"),
        charge,
        multiplicity,
        kind,
        geometryXyz: null,
      },
      conformer: conformer ? { label: conformer, geometryXyz: null } : null,
      level,
      calculation: {
        electronicEnergyHartree,
        frequencies,
        thermal: temperatureK ? { temperatureK, zpeHartree: zpe, enthalpyCorrectionHartree: h, gibbsCorrectionHartree: g } : null,
        converged,
        sourceNote: text("sourceNote") ?? "",
      },
    });
  }
  return { format, rows, problems, columns };
}

/**
 * The filled example the import page offers: the invented demo scenario (Ni(0)/phosphite
 * hydrocyanation of 4-methoxystyrene). Energies are plausible but made up.
 */
export const TEMPLATE_HEADINGS = [
  "Species", "Formula", "SMILES", "Charge", "Multiplicity", "Kind", "Method", "Basis", "Dispersion", "Solvation model", "Solvent",
  "Electronic energy (hartree)", "Frequencies (cm-1)", "Thermal temperature (K)", "ZPE (hartree)", "Enthalpy correction (hartree)",
  "Gibbs correction (hartree)", "Converged", "Source note",
] as const;

export const TEMPLATE_EXAMPLE: readonly (readonly (string | number)[])[] = [
  ["HCN", "CHN", "C#N", 0, 1, "minimum", "B3LYP", "def2-TZVP", "D3(BJ)", "SMD", "toluene", "-93.4461027381", "727.1 727.1 2207.9 3446.2", 298.15, "0.015721", "0.019026", "-0.004911", "yes", "invented example: hcn-opt-freq"],
  ["MeO-styrene", "C9H10O", "COc1ccc(C=C)cc1", 0, 1, "minimum", "B3LYP", "def2-TZVP", "D3(BJ)", "SMD", "toluene", "-424.8812630544", "", 298.15, "0.164832", "0.175203", "0.127115", "yes", "invented example: styrene-opt-freq"],
  ["TS-HCN-add", "C10H11NO", "", 0, 1, "transition state", "B3LYP", "def2-TZVP", "D3(BJ)", "SMD", "toluene", "-518.2987713065", "-412.3 48.2 61.7", 298.15, "0.181113", "0.193457", "0.139874", "yes", "invented example: ts-scan-12"],
];

/** CSV text of the template (comma-separated, decimal point, UTF-8). */
export function templateCsv(): string {
  const quote = (v: string | number) => {
    const s = String(v);
    return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  return [TEMPLATE_HEADINGS, ...TEMPLATE_EXAMPLE].map((r) => r.map(quote).join(",")).join("\r\n") + "\r\n";
}
