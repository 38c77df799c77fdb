/**
 * The ledger as CSV: one row per calculation with its stored values (hartree, exact text), then one row
 * per reaction with its computed values in the chosen unit. UTF-8 with a byte-order mark so that
 * spreadsheet programs read the Δ and ‡ of the headings.
 */
import type { WorkbookData } from "./types";

const cell = (v: string | number | boolean | null | undefined): string => {
  if (v === null || v === undefined) return "";
  const s = typeof v === "boolean" ? (v ? "yes" : "no") : String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};
const line = (cells: (string | number | boolean | null | undefined)[]) => cells.map(cell).join(",") + "\r\n";

export function* ledgerCsvChunks(d: WorkbookData): Generator<string> {
  yield "\uFEFF";
  yield line(["Section", "Calculation id", "Species", "Conformer", "Level", "Electronic energy (hartree)", "Thermal temperature (K)", "ZPE (hartree)", "Enthalpy correction (hartree)", "Gibbs correction (hartree)", "Converged", "Source note"]);
  for (const c of d.calculations) {
    yield line(["calculation", c.id, c.species, c.conformer, c.level, c.electronicEnergy, c.thermalTemperatureK, c.zpe, c.enthalpyCorrection, c.gibbsCorrection, c.converged, c.source]);
  }
  const u = d.unit;
  yield "\r\n";
  yield line(["Section", "Reaction id", "Equation", "Transition state", "Protocol", "Status", `ΔE (${u})`, `ΔE+ZPE (${u})`, `ΔH (${u})`, `ΔG (${u})`, `ΔE‡ (${u})`, `ΔG‡ (${u})`, "k (Eyring)", "Unit of k", "K", "Problems"]);
  for (const r of d.reactions) {
    const v = r.values;
    yield line(["reaction", r.id, r.equation, r.transitionState, r.protocol, r.status, v.deltaE, v.deltaEZPE, v.deltaH, v.deltaG, v.barrierE, v.barrierG, v.rateConstant, r.rateConstantUnit, v.equilibriumConstant, r.problems]);
  }
}

export function ledgerCsv(d: WorkbookData): string {
  return [...ledgerCsvChunks(d)].join("");
}
