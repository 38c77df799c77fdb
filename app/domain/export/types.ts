/**
 * Everything a Supporting Information workbook shows, as plain data. The export service gathers it from
 * the live ledger; a snapshot passes its frozen copy instead (state.kind "snapshot").
 */
export type WorkbookState = { kind: "live" } | { kind: "snapshot"; id: number; checksum: string; takenAt?: string; name?: string };

export interface WorkbookData {
  project: { id: number; name: string; description: string };
  exportedBy: string;
  exportedAt: string;
  state: WorkbookState;
  /** Unit of every computed (relative) energy in the reactions and pathways sheets. */
  unit: string;
  /** The protocol the reactions and pathways were computed under, or null for "each its own". */
  protocolName: string | null;
  constants: { edition: string; values: { name: string; symbol: string; value: number; unit: string; exact: boolean }[] };
  conventions: string[];
  levels: { id: number; name: string; key: string; method: string; basis: string; dispersion: string | null; solvationModel: string | null; solvent: string | null }[];
  protocols: {
    id: number; name: string; energyLevel: string; thermalLevel: string; thermalSource: string; temperatureK: number; standardState: string;
    lowFrequency: string; lowFrequencyCutoffCm1: number; frequencyScale: number; conformerTreatment: string; isDefault: boolean;
  }[];
  species: { id: number; label: string; formula: string | null; smiles: string | null; charge: number; multiplicity: number; kind: string; symmetryNumber: number }[];
  /** Every stored calculation; absolute energies as the decimal text stored (full precision). */
  calculations: {
    id: number; species: string; conformer: string | null; level: string; electronicEnergy: string | null; thermalTemperatureK: number | null;
    zpe: string | null; enthalpyCorrection: string | null; gibbsCorrection: string | null; frequencyCount: number; imaginaryModes: number | null;
    /** Stored harmonic wavenumbers in cm-1, in stored order (empty when none). */
    frequencies: number[];
    converged: boolean; source: string;
  }[];
  /** Each species under each protocol: thermal corrections and absolute E, E+ZPE, H, G in hartree (decimal text). */
  speciesUnderProtocols: {
    protocol: string; species: string; thermalSource: string | null; zpe: number | null; enthalpyCorrection: number | null; gibbsCorrection: number | null;
    E: string | null; EZPE: string | null; H: string | null; G: string | null; problems: string;
  }[];
  reactions: {
    id: number; equation: string; transitionState: string | null; protocol: string | null; status: string;
    values: { deltaE: number | null; deltaEZPE: number | null; deltaH: number | null; deltaG: number | null; barrierE: number | null; barrierG: number | null; rateConstant: number | null; equilibriumConstant: number | null };
    rateConstantUnit: string; temperatureK: number | null; problems: string;
  }[];
  pathways: {
    id: number; name: string; cycle: boolean; protocol: string | null;
    states: { label: string; kind: string; relativeE: number | null; relativeEZPE: number | null; relativeH: number | null; relativeG: number | null }[];
    energeticSpan: { deltaE: number; tdts: string; tdi: string; tof: number } | null;
    problems: string;
  }[];
  findings: { severity: string; code: string; object: string; message: string }[];
  geometries: { label: string; conformer: string | null; charge: number; multiplicity: number; energyHartree: string | null; energyLevel: string | null; atoms: { symbol: string; x: number; y: number; z: number }[] }[];
}
