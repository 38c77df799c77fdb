import { Readable } from "node:stream";
import { db } from "../../db";
import type { Project, User } from "../../db/models/foundation";
import { CODATA_EDITION, parseXyz, PRIMARY_CONSTANTS } from "../domain/thermo";
import { ledgerCsvChunks } from "../domain/export/ledger-csv";
import type { WorkbookData, WorkbookState } from "../domain/export/types";
import { buildWorkbook, streamWorkbook } from "../domain/export/workbook";
import { auditProject } from "./audit.server";
import { acceptanceNote, activeAcceptances, findingKey } from "./comments.server";
import { parseJsonColumn } from "./history.server";
import {
  computePathways, computeReactions, describeProtocolRow, evaluateProjectSpecies, loadLedgerData, parseUnit,
} from "./ledger-compute.server";

/**
 * Gathers what the Supporting Information workbook and the ledger CSV show, from the live ledger: the
 * reactions, pathways and audit as their services compute them (no number is recomputed here), and the
 * stored inputs as stored. A frozen snapshot can hand its own WorkbookData to buildWorkbook instead.
 */
export type ExportOptions = { unit?: string | null; protocol?: string | number | null };

export const EXPORT_CONVENTIONS = [
  "Absolute energies are in hartree, exactly as stored (the text columns keep every digit; the number columns show what a spreadsheet number can hold).",
  "Relative energies are products minus reactants (or states minus the pathway's first state), in the unit named in each heading.",
  "ΔE+ZPE, ΔH and ΔG use the thermal corrections of each protocol's thermal level (computed from stored frequencies with the rigid-rotor harmonic-oscillator model, or stored corrections), at the protocol's temperature and standard state.",
  "Barriers ΔE‡ and ΔG‡ are the transition state minus the reactants; rate constants come from the Eyring equation with a transmission coefficient of 1 and rest on the computed barrier.",
  "Coordinates are Cartesian, in ångström.",
];

function dec(d: { toString(): string } | null | undefined): string | null {
  return d === null || d === undefined ? null : d.toString();
}

function atomsOf(xyz: string | null | undefined) {
  if (!xyz) return null;
  try {
    const g = parseXyz(xyz)[0];
    if (!g) return null;
    return g.symbols.map((symbol, i) => ({ symbol, x: g.coordinates[i]![0], y: g.coordinates[i]![1], z: g.coordinates[i]![2] }));
  } catch {
    return null;
  }
}

export async function gatherExportData(project: Project, user: Pick<User, "name" | "email">, options: ExportOptions = {}, state: WorkbookState = { kind: "live" }): Promise<WorkbookData> {
  const unit = parseUnit(options.unit ?? null);
  const protocolRef = options.protocol === "" ? null : (options.protocol ?? null);
  const { models } = db();
  const [data, reactions, pathways, audit, calcs, speciesRows, conformers] = await Promise.all([
    loadLedgerData(project.id),
    computeReactions(project.id, { unit, protocol: protocolRef }),
    computePathways(project.id, { unit, protocol: protocolRef }),
    auditProject(project.id),
    models.Calculation.findAll({ where: { projectId: project.id }, order: [["id", "ASC"]] }),
    models.Species.findAll({ where: { projectId: project.id }, attributes: ["id", "label", "charge", "multiplicity", "geometryXyz"], order: [["id", "ASC"]] }),
    db().sequelize.query<{ id: number; speciesId: number; label: string; geometryXyz: string | null }>(
      "SELECT c.id, c.species_id AS speciesId, c.label, c.geometry_xyz AS geometryXyz FROM conformers c JOIN species s ON s.id = c.species_id WHERE s.project_id = ? ORDER BY c.id",
      { type: "SELECT" as never, replacements: [project.id] },
    ) as unknown as Promise<{ id: number; speciesId: number; label: string; geometryXyz: string | null }[]>,
  ]);
  const protocolName = new Map(data.protocols.map((p) => [p.id, p.name]));
  const levelLabel = (id: number) => data.levels.get(id)?.label ?? `level #${id}`;
  const speciesLabel = (id: number) => data.species.get(id)?.label ?? `species #${id}`;
  const conformerLabel = new Map(conformers.map((c) => [c.id, c.label]));

  const speciesUnderProtocols: WorkbookData["speciesUnderProtocols"] = [];
  for (const p of data.protocols) {
    const ctx = await evaluateProjectSpecies(data, p);
    for (const s of data.species.values()) {
      const ev = ctx.memo.get(s.id);
      if (!ev) continue;
      const single = ev.members.length === 1 ? ev.members[0]! : null;
      speciesUnderProtocols.push({
        protocol: p.name,
        species: s.label,
        thermalSource: single?.thermalSource ?? null,
        zpe: single?.zpe ?? null,
        enthalpyCorrection: single?.enthalpyCorrection ?? null,
        gibbsCorrection: single && single.gibbsCorrection !== null ? single.gibbsCorrection + (single.standardStateCorrection ?? 0) : null,
        E: dec(ev.energies.E),
        EZPE: dec(ev.energies.EZPE),
        H: dec(ev.energies.H),
        G: dec(ev.energies.G),
        problems: [...ev.problems, ...ev.missing.G].map((x) => x.message).join("; "),
      });
    }
  }

  // The geometry block's energy: the species' calculation at the default protocol's energy level, if any.
  const defaultProtocol = data.protocols.find((p) => p.id === data.defaultProtocolId) ?? data.protocols[0] ?? null;
  // Indexed once: a project of thousands of species must not scan every calculation per geometry.
  const calcsBy = new Map<string, typeof calcs>();
  for (const c of calcs) {
    if (!c.electronicEnergyText) continue;
    const key = `${c.speciesId}|${c.conformerId ?? 0}`;
    const list = calcsBy.get(key);
    if (list) list.push(c);
    else calcsBy.set(key, [c]);
  }
  const conformersBy = new Map<number, typeof conformers>();
  for (const c of conformers) {
    const list = conformersBy.get(c.speciesId);
    if (list) list.push(c);
    else conformersBy.set(c.speciesId, [c]);
  }
  const energyFor = (speciesId: number, conformerId: number | null) => {
    const list = calcsBy.get(`${speciesId}|${conformerId ?? 0}`) ?? [];
    const at = defaultProtocol ? list.filter((c) => c.levelId === defaultProtocol.energyLevelId) : [];
    const c = (at.length ? at : list)[(at.length ? at : list).length - 1];
    return c ? { energyHartree: c.electronicEnergyText ?? null, energyLevel: levelLabel(c.levelId) } : { energyHartree: null, energyLevel: null };
  };
  const geometries: WorkbookData["geometries"] = [];
  for (const s of speciesRows) {
    const atoms = atomsOf(s.geometryXyz);
    if (atoms) geometries.push({ label: s.label, conformer: null, charge: s.charge, multiplicity: s.multiplicity, ...energyFor(s.id, null), atoms });
    for (const c of conformersBy.get(s.id) ?? []) {
      const ca = atomsOf(c.geometryXyz);
      if (ca) geometries.push({ label: s.label, conformer: c.label, charge: s.charge, multiplicity: s.multiplicity, ...energyFor(s.id, c.id), atoms: ca });
    }
  }

  const accepted = await activeAcceptances(project.id);
  return {
    project: { id: project.id, name: project.name, description: project.description ?? "" },
    exportedBy: `${user.name} <${user.email}>`,
    exportedAt: new Date().toISOString(),
    state,
    unit,
    protocolName: reactions.protocol && protocolRef !== null ? reactions.protocol.name : null,
    constants: { edition: CODATA_EDITION, values: PRIMARY_CONSTANTS.map((c) => ({ name: c.name, symbol: c.symbol, value: c.value, unit: c.unit, exact: c.exact })) },
    conventions: EXPORT_CONVENTIONS,
    levels: [...data.levels.values()].map((l) => ({ id: l.id, name: l.label, key: l.key, method: l.method, basis: l.basis, dispersion: l.dispersion, solvationModel: l.solvationModel, solvent: l.solvent })),
    protocols: data.protocols.map((p) => {
      const d = describeProtocolRow(data, p);
      return {
        id: p.id, name: p.name, energyLevel: d.energyLevel?.label ?? "", thermalLevel: d.thermalLevel?.label ?? "", thermalSource: p.thermalSource,
        temperatureK: Number(p.temperatureK), standardState: p.standardState, lowFrequency: p.lowFrequencyTreatment,
        lowFrequencyCutoffCm1: Number(p.lowFrequencyCutoffCm1), frequencyScale: Number(p.frequencyScale), conformerTreatment: p.conformerTreatment, isDefault: d.isDefault,
      };
    }),
    species: [...data.species.values()].map((s) => ({ id: s.id, label: s.label, formula: s.formula, smiles: s.smiles, charge: s.charge, multiplicity: s.multiplicity, kind: s.kind, symmetryNumber: s.symmetryNumber })),
    calculations: calcs.map((c) => {
      const f = parseJsonColumn(c.frequencies);
      const list = Array.isArray(f) ? (f as number[]) : null;
      return {
        id: c.id, species: speciesLabel(c.speciesId), conformer: c.conformerId ? (conformerLabel.get(c.conformerId) ?? null) : null, level: levelLabel(c.levelId),
        electronicEnergy: c.electronicEnergyText ?? null, thermalTemperatureK: c.thermalTemperatureK === null || c.thermalTemperatureK === undefined ? null : Number(c.thermalTemperatureK),
        zpe: c.zpeHartree ?? null, enthalpyCorrection: c.enthalpyCorrectionHartree ?? null, gibbsCorrection: c.gibbsCorrectionHartree ?? null,
        frequencyCount: list?.length ?? 0, frequencies: list ?? [], imaginaryModes: list ? list.filter((x) => x < 0).length : null, converged: !!c.converged, source: c.sourceNote ?? "",
      };
    }),
    speciesUnderProtocols,
    reactions: reactions.reactions.map((r) => ({
      id: r.id, equation: r.equation, transitionState: r.transitionState, protocol: r.protocolId ? (protocolName.get(r.protocolId) ?? null) : null, status: r.status,
      values: r.values, rateConstantUnit: r.rateConstantUnit, temperatureK: r.temperatureK, problems: r.problems.map((p) => p.message).join("; "),
    })),
    pathways: pathways.pathways.map((w) => ({
      id: w.pathway.id, name: w.pathway.name, cycle: !!w.pathway.cycle, protocol: w.protocol?.name ?? null,
      states: w.states.map((s) => ({ label: s.label, kind: s.kind, relativeE: s.relativeE, relativeEZPE: s.relativeEZPE, relativeH: s.relativeH, relativeG: s.relativeG })),
      energeticSpan: w.energeticSpan ? { deltaE: w.energeticSpan.deltaE, tdts: w.energeticSpan.tdts, tdi: w.energeticSpan.tdi, tof: w.energeticSpan.tof } : null,
      problems: w.problems.map((p) => p.message).join("; "),
    })),
    findings: audit.findings.map((f) => ({ severity: f.severity, code: f.code, object: `${f.object.type} ${f.object.label}`, message: f.message + acceptanceNote(accepted.get(findingKey(f))) })),
    geometries,
  };
}

const safeName = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "project";

export const XLSX_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet";

/** The workbook as a stream for an HTTP answer. */
export async function exportWorkbook(project: Project, user: Pick<User, "name" | "email">, options: ExportOptions) {
  const data = await gatherExportData(project, user, options);
  return { fileName: `${safeName(project.name)}-SI.xlsx`, body: Readable.toWeb(streamWorkbook(data)) as ReadableStream<Uint8Array> };
}

export async function exportLedgerCsv(project: Project, user: Pick<User, "name" | "email">, options: ExportOptions) {
  const data = await gatherExportData(project, user, options);
  const bytes = function* () {
    for (const chunk of ledgerCsvChunks(data)) yield Buffer.from(chunk, "utf8");
  };
  const body = Readable.toWeb(Readable.from(bytes())) as ReadableStream<Uint8Array>;
  return { fileName: `${safeName(project.name)}-ledger.csv`, body };
}

export { buildWorkbook };
