/**
 * What every import parser returns: rows normalised to the ledger's vocabulary, and every problem found
 * (not just the first), each pointing at a row and a column as the person sees them in their file.
 */
export type ImportFormat = "csv" | "xlsx" | "qcschema" | "xyz";

export interface ImportProblem {
  /** Row as counted in the file: spreadsheet row (heading = 1), QCSchema entry (1-based), XYZ line. */
  row: number;
  /** Column heading as written in the file, a JSON path (QCSchema) or a part of an XYZ frame. */
  column: string;
  message: string;
}

export type ImportField =
  | "species" | "formula" | "smiles" | "charge" | "multiplicity" | "kind" | "conformer" | "geometry"
  | "level" | "method" | "basis" | "dispersion" | "solvationModel" | "solvent"
  | "electronicEnergy" | "frequencies" | "thermalTemperature" | "zpe" | "enthalpyCorrection" | "gibbsCorrection"
  | "converged" | "sourceNote";

export type LevelParts =
  | { text: string }
  | { method: string; basis: string; dispersion: string | null; solvation: { model: string; solvent: string } | null };

export interface ImportSpecies {
  label: string;
  formula: string | null;
  smiles: string | null;
  charge: number | null;
  multiplicity: number | null;
  kind: "minimum" | "transition-state" | null;
  /** XYZ text in Å. */
  geometryXyz: string | null;
}

export interface ImportThermal {
  temperatureK: string;
  zpeHartree: string | null;
  enthalpyCorrectionHartree: string | null;
  gibbsCorrectionHartree: string | null;
}

export interface ImportCalculation {
  /** Decimal string in hartree (converted when the file gave another unit). */
  electronicEnergyHartree: string | null;
  frequencies: number[] | null;
  thermal: ImportThermal | null;
  converged: boolean;
  sourceNote: string;
}

export interface ImportRow {
  row: number;
  species: ImportSpecies;
  conformer: { label: string; geometryXyz: string | null } | null;
  level: LevelParts | null;
  /** null for geometry-only rows (XYZ). */
  calculation: ImportCalculation | null;
}

export interface ParsedImport {
  format: ImportFormat;
  rows: ImportRow[];
  problems: ImportProblem[];
  /** Where each field sits in this file, so later checks can name the column. */
  columns: Partial<Record<ImportField, string>>;
}
