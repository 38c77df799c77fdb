/**
 * The Supporting Information workbook, written with exceljs's streaming writer (rows go out as they are
 * made, so memory stays bounded by one sheet's buffer, not by the project). Plain data in (WorkbookData),
 * bytes out. Numbers are written as numbers with number formats; each absolute energy also appears as
 * the exact decimal text stored, since a spreadsheet number keeps only about 15 significant digits.
 */
import { PassThrough, type Readable } from "node:stream";
import ExcelJS from "exceljs";
import type { WorkbookData } from "./types";

type Col = { header: string; key: string; width: number; numFmt?: string };

const HARTREE_FMT = "0.000000000000";
const SMALL_FMT = "0.000000";
const REL_FMT = "0.00";
const SCI_FMT = "0.000E+00";
const COORD_FMT = "0.000000";

const num = (v: string | number | null | undefined): number | null => {
  if (v === null || v === undefined || v === "") return null;
  const n = typeof v === "number" ? v : Number(v);
  return Number.isFinite(n) ? n : null;
};

function sheet(wb: ExcelJS.stream.xlsx.WorkbookWriter, name: string, cols: Col[]) {
  const ws = wb.addWorksheet(name, { views: [{ state: "frozen", ySplit: 1 }] });
  ws.columns = cols.map((c) => ({ header: c.header, key: c.key, width: c.width, style: c.numFmt ? { numFmt: c.numFmt } : {} }));
  ws.getRow(1).font = { bold: true };
  return ws;
}

/** Writes the workbook to a stream (for an HTTP answer). */
export function streamWorkbook(data: WorkbookData): Readable {
  const out = new PassThrough();
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
  wb.creator = "Thermotally";
  wb.created = new Date(data.exportedAt);
  void writeAll(wb, data).catch((e) => out.destroy(e as Error));
  return out;
}

/** The whole workbook as bytes (tests, benches, snapshots). */
export async function buildWorkbook(data: WorkbookData): Promise<Uint8Array> {
  const chunks: Buffer[] = [];
  const stream = streamWorkbook(data);
  for await (const c of stream) chunks.push(c as Buffer);
  return new Uint8Array(Buffer.concat(chunks));
}

async function writeAll(wb: ExcelJS.stream.xlsx.WorkbookWriter, d: WorkbookData) {
  const u = d.unit;
  // ---- cover
  const cover = sheet(wb, "Cover", [
    { header: "Item", key: "k", width: 34 },
    { header: "Value", key: "v", width: 110 },
  ]);
  const line = (k: string, v: string | number) => cover.addRow({ k, v }).commit();
  line("Project", d.project.name);
  if (d.project.description) line("Description", d.project.description);
  line("Exported by", d.exportedBy);
  line("Exported at (UTC)", d.exportedAt);
  if (d.state.kind === "live") line("State", "Live state of the project at the time of export (not a frozen snapshot)");
  else {
    line("State", `Snapshot #${d.state.id}${d.state.name ? ` (${d.state.name})` : ""}${d.state.takenAt ? `, taken ${d.state.takenAt}` : ""}`);
    line("Snapshot checksum (SHA-256)", d.state.checksum);
  }
  line("Unit of computed energies", u);
  line("Protocol of reactions and pathways", d.protocolName ?? "each reaction and pathway under its own protocol (else the project default)");
  line("Physical constants", d.constants.edition);
  for (const c of d.constants.values) line(`  ${c.name} (${c.symbol})`, `${c.value} ${c.unit}${c.exact ? " (exact)" : ""}`);
  for (const [i, c] of d.conventions.entries()) line(i === 0 ? "Conventions" : "", c);
  line("Note", "Computed values are model estimates — not a substitute for calorimetric hazard testing or a process-safety review of a scale-up (thermal runaway); local regulations and qualified practice decide.");
  cover.commit();

  // ---- levels and protocols
  const lv = sheet(wb, "Levels", [
    { header: "Level id", key: "id", width: 9 },
    { header: "Level", key: "name", width: 44 },
    { header: "Canonical key", key: "key", width: 44 },
    { header: "Method", key: "method", width: 16 },
    { header: "Basis set", key: "basis", width: 16 },
    { header: "Dispersion", key: "dispersion", width: 12 },
    { header: "Solvation model", key: "solvationModel", width: 16 },
    { header: "Solvent", key: "solvent", width: 16 },
  ]);
  for (const l of d.levels) lv.addRow({ ...l, dispersion: l.dispersion ?? "", solvationModel: l.solvationModel ?? "", solvent: l.solvent ?? "" }).commit();
  lv.commit();
  const pr = sheet(wb, "Protocols", [
    { header: "Protocol id", key: "id", width: 11 },
    { header: "Protocol", key: "name", width: 28 },
    { header: "Default", key: "isDefault", width: 9 },
    { header: "Energy level", key: "energyLevel", width: 40 },
    { header: "Thermal level", key: "thermalLevel", width: 40 },
    { header: "Thermal corrections", key: "thermalSource", width: 18 },
    { header: "Temperature (K)", key: "temperatureK", width: 15, numFmt: "0.00" },
    { header: "Standard state", key: "standardState", width: 14 },
    { header: "Low-frequency treatment", key: "lowFrequency", width: 22 },
    { header: "Low-frequency cutoff (cm-1)", key: "lowFrequencyCutoffCm1", width: 24, numFmt: "0.0" },
    { header: "Frequency scale factor", key: "frequencyScale", width: 20, numFmt: "0.0000" },
    { header: "Conformers", key: "conformerTreatment", width: 12 },
  ]);
  for (const p of d.protocols) pr.addRow({ ...p, isDefault: p.isDefault ? "yes" : "" }).commit();
  pr.commit();

  // ---- species and calculations
  const sp = sheet(wb, "Species", [
    { header: "Species", key: "label", width: 22 },
    { header: "Formula", key: "formula", width: 16 },
    { header: "SMILES", key: "smiles", width: 30 },
    { header: "Charge", key: "charge", width: 8, numFmt: "0" },
    { header: "Multiplicity", key: "multiplicity", width: 11, numFmt: "0" },
    { header: "Kind", key: "kind", width: 16 },
    { header: "Symmetry number", key: "symmetryNumber", width: 15, numFmt: "0" },
  ]);
  for (const s of d.species) sp.addRow({ ...s, formula: s.formula ?? "", smiles: s.smiles ?? "" }).commit();
  sp.commit();
  const ca = sheet(wb, "Calculations", [
    { header: "Calculation id", key: "id", width: 13 },
    { header: "Species", key: "species", width: 22 },
    { header: "Conformer", key: "conformer", width: 12 },
    { header: "Level", key: "level", width: 40 },
    { header: "Electronic energy (hartree)", key: "e", width: 24, numFmt: HARTREE_FMT },
    { header: "Electronic energy as stored (hartree, text)", key: "eText", width: 26 },
    { header: "Thermal temperature (K)", key: "t", width: 14, numFmt: "0.00" },
    { header: "ZPE (hartree)", key: "zpe", width: 14, numFmt: SMALL_FMT },
    { header: "Enthalpy correction (hartree)", key: "h", width: 16, numFmt: SMALL_FMT },
    { header: "Gibbs correction (hartree)", key: "g", width: 16, numFmt: SMALL_FMT },
    { header: "Frequencies (count)", key: "nf", width: 12, numFmt: "0" },
    { header: "Imaginary modes", key: "ni", width: 12, numFmt: "0" },
    { header: "Frequencies (cm-1, as stored; imaginary negative)", key: "freqs", width: 60 },
    { header: "Converged", key: "converged", width: 10 },
    { header: "Source note", key: "source", width: 40 },
  ]);
  for (const c of d.calculations) {
    ca.addRow({
      id: c.id, species: c.species, conformer: c.conformer ?? "", level: c.level, e: num(c.electronicEnergy), eText: c.electronicEnergy ?? "",
      t: c.thermalTemperatureK, zpe: num(c.zpe), h: num(c.enthalpyCorrection), g: num(c.gibbsCorrection), nf: c.frequencyCount, ni: c.imaginaryModes,
      freqs: c.frequencies.join(" "),
      converged: c.converged ? "yes" : "no", source: c.source,
    }).commit();
  }
  ca.commit();
  const su = sheet(wb, "Species by protocol", [
    { header: "Protocol", key: "protocol", width: 24 },
    { header: "Species", key: "species", width: 22 },
    { header: "Thermal corrections", key: "thermalSource", width: 16 },
    { header: "ZPE (hartree)", key: "zpe", width: 14, numFmt: SMALL_FMT },
    { header: "Enthalpy correction (hartree)", key: "h", width: 16, numFmt: SMALL_FMT },
    { header: "Gibbs correction incl. standard state (hartree)", key: "g", width: 20, numFmt: SMALL_FMT },
    { header: "E (hartree)", key: "E", width: 22, numFmt: HARTREE_FMT },
    { header: "E + ZPE (hartree)", key: "EZPE", width: 22, numFmt: HARTREE_FMT },
    { header: "H (hartree)", key: "H", width: 22, numFmt: HARTREE_FMT },
    { header: "G (hartree)", key: "G", width: 22, numFmt: HARTREE_FMT },
    { header: "G as computed (hartree, text)", key: "GText", width: 26 },
    { header: "Problems", key: "problems", width: 60 },
  ]);
  for (const s of d.speciesUnderProtocols) {
    su.addRow({ ...s, thermalSource: s.thermalSource ?? "", zpe: s.zpe, h: s.enthalpyCorrection, g: s.gibbsCorrection, E: num(s.E), EZPE: num(s.EZPE), H: num(s.H), G: num(s.G), GText: s.G ?? "" }).commit();
  }
  su.commit();

  // ---- reactions and pathways
  const re = sheet(wb, "Reactions", [
    { header: "Reaction id", key: "id", width: 11 },
    { header: "Equation", key: "equation", width: 44 },
    { header: "Transition state", key: "ts", width: 16 },
    { header: "Protocol", key: "protocol", width: 22 },
    { header: "Status", key: "status", width: 12 },
    { header: `ΔE (${u})`, key: "deltaE", width: 12, numFmt: REL_FMT },
    { header: `ΔE+ZPE (${u})`, key: "deltaEZPE", width: 14, numFmt: REL_FMT },
    { header: `ΔH (${u})`, key: "deltaH", width: 12, numFmt: REL_FMT },
    { header: `ΔG (${u})`, key: "deltaG", width: 12, numFmt: REL_FMT },
    { header: `ΔE‡ (${u})`, key: "barrierE", width: 12, numFmt: REL_FMT },
    { header: `ΔG‡ (${u})`, key: "barrierG", width: 12, numFmt: REL_FMT },
    { header: "Temperature (K)", key: "T", width: 14, numFmt: "0.00" },
    { header: "k (Eyring, from ΔG‡; unit in the next column)", key: "k", width: 16, numFmt: SCI_FMT },
    { header: "Unit of k", key: "kUnit", width: 30 },
    { header: "K (from ΔG, dimensionless)", key: "K", width: 18, numFmt: SCI_FMT },
    { header: "Problems", key: "problems", width: 80 },
  ]);
  for (const r of d.reactions) {
    re.addRow({ id: r.id, equation: r.equation, ts: r.transitionState ?? "", protocol: r.protocol ?? "", status: r.status, ...r.values, T: r.temperatureK, k: r.values.rateConstant, kUnit: r.rateConstantUnit, K: r.values.equilibriumConstant, problems: r.problems }).commit();
  }
  re.commit();
  const pw = sheet(wb, "Pathways", [
    { header: "Pathway", key: "name", width: 28 },
    { header: "Cycle", key: "cycle", width: 7 },
    { header: "Protocol", key: "protocol", width: 22 },
    { header: "Position", key: "pos", width: 9, numFmt: "0" },
    { header: "State", key: "label", width: 24 },
    { header: "Kind", key: "kind", width: 16 },
    { header: `Relative E (${u})`, key: "relativeE", width: 16, numFmt: REL_FMT },
    { header: `Relative E+ZPE (${u})`, key: "relativeEZPE", width: 18, numFmt: REL_FMT },
    { header: `Relative H (${u})`, key: "relativeH", width: 16, numFmt: REL_FMT },
    { header: `Relative G (${u})`, key: "relativeG", width: 16, numFmt: REL_FMT },
    { header: `Energetic span δE (${u})`, key: "span", width: 18, numFmt: REL_FMT },
    { header: "TOF (s-1, energetic span model)", key: "tof", width: 18, numFmt: SCI_FMT },
    { header: "Problems", key: "problems", width: 60 },
  ]);
  for (const p of d.pathways) {
    p.states.forEach((s, i) => {
      pw.addRow({
        name: p.name, cycle: p.cycle ? "yes" : "no", protocol: p.protocol ?? "", pos: i + 1, ...s,
        span: i === 0 ? (p.energeticSpan?.deltaE ?? null) : null, tof: i === 0 ? (p.energeticSpan?.tof ?? null) : null, problems: i === 0 ? p.problems : "",
      }).commit();
    });
  }
  pw.commit();

  // ---- audit
  const au = sheet(wb, "Audit", [
    { header: "Severity", key: "severity", width: 10 },
    { header: "Rule", key: "code", width: 26 },
    { header: "Object", key: "object", width: 40 },
    { header: "Finding", key: "message", width: 110 },
  ]);
  for (const f of d.findings) au.addRow(f).commit();
  au.commit();

  // ---- coordinates, in the block layout of an SI
  const co = wb.addWorksheet("Coordinates");
  co.columns = [
    { key: "a", width: 26 },
    { key: "x", width: 16, style: { numFmt: COORD_FMT } },
    { key: "y", width: 16, style: { numFmt: COORD_FMT } },
    { key: "z", width: 16, style: { numFmt: COORD_FMT } },
    { key: "e", width: 50 },
  ];
  co.addRow(["Cartesian coordinates (Å) of every species with a geometry"]).commit();
  for (const g of d.geometries) {
    co.addRow([]).commit();
    const title = co.addRow([g.conformer ? `${g.label} (conformer ${g.conformer})` : g.label]);
    title.font = { bold: true };
    title.commit();
    // Whole numbers: the column's coordinate format would show a charge of 0 as 0.000000.
    for (const [k, v] of [["Charge", g.charge], ["Multiplicity", g.multiplicity]] as const) {
      const r = co.addRow([k, v]);
      r.getCell(2).numFmt = "0";
      r.commit();
    }
    const er = co.addRow(["Electronic energy (hartree)", num(g.energyHartree), null, null, g.energyLevel ?? ""]);
    er.getCell(2).numFmt = HARTREE_FMT;
    er.commit();
    co.addRow(["Atom", "x (Å)", "y (Å)", "z (Å)"]).commit();
    for (const a of g.atoms) co.addRow([a.symbol, a.x, a.y, a.z]).commit();
  }
  co.commit();
  await wb.commit();
}
