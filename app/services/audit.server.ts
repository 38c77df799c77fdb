import { BUILT_IN_BASIS, classifyBasis, electronCount, isMultiplicityPossible } from "../domain/thermo";
import { energyPlausibility } from "../domain/thermo/plausibility";
import type { Project } from "../../db/models/foundation";
import { energiesDisagree, type CellFlag } from "./calculations.server";
import {
  computeProjectLedger, frequenciesOf, speciesComposition,
  type CalcRow, type LedgerData, type Problem, type ProtocolRow, type SpeciesRow,
} from "./ledger-compute.server";
import { overviewCountProviders } from "./overview.server";

/**
 * The audit (PRODUCT.md §8): findings over the whole project, each naming and linking the object it
 * concerns. Errors are the conditions under which the ledger refuses a value (they come from the same
 * computation, so the audit and the ledger never disagree); warnings and notes do not block anything.
 */
export type Severity = "error" | "warning" | "note";
export type AuditObject = { type: "reaction" | "pathway" | "species" | "calculation" | "protocol" | "level" | "project" | "snapshot"; id: number; label: string };
export type Finding = { severity: Severity; code: string; message: string; object: AuditObject; link: string };
export type AuditContext = Awaited<ReturnType<typeof computeProjectLedger>> & { projectId: number };

/**
 * Further rules from other parts of the app (e.g. edits after a sign-off); each returns its findings.
 * Push to this list at module load.
 */
export const auditExtraRules: ((ctx: AuditContext) => Finding[] | Promise<Finding[]>)[] = [];

const links = (projectId: number) => ({
  reaction: (id: number) => `/projects/${projectId}/reactions?reaction=${id}`,
  pathway: (id: number) => `/projects/${projectId}/pathways/${id}`,
  species: (id: number) => `/projects/${projectId}/species/${id}`,
  protocol: () => `/projects/${projectId}/protocols`,
  level: () => `/projects/${projectId}/levels`,
});

/** Row problems that the audit reports under its own per-object rules instead (to avoid saying it twice). */
const REPORTED_PER_OBJECT = new Set(["not_converged", "low_frequency_untreated", "ts_no_frequencies", "minimum_imaginary", "ts_imaginary_modes", "ts_kind"]);

function fromProblems(problems: Problem[], object: AuditObject, link: string): Finding[] {
  return problems
    .filter((p) => !REPORTED_PER_OBJECT.has(p.code) && p.code !== "balance_unchecked")
    .map((p) => ({ severity: p.severity, code: p.code, message: `${object.label}: ${p.message}`, object, link }));
}

function protocolDiffers(a: ProtocolRow, b: ProtocolRow): string[] {
  const out: string[] = [];
  if (Number(a.temperatureK) !== Number(b.temperatureK)) out.push(`temperature ${Number(a.temperatureK)} K vs ${Number(b.temperatureK)} K`);
  if (a.standardState !== b.standardState) out.push(`standard state ${a.standardState} vs ${b.standardState}`);
  if (a.lowFrequencyTreatment !== b.lowFrequencyTreatment || Number(a.lowFrequencyCutoffCm1) !== Number(b.lowFrequencyCutoffCm1)) {
    out.push(`low-frequency treatment ${a.lowFrequencyTreatment} (${Number(a.lowFrequencyCutoffCm1)} cm⁻¹) vs ${b.lowFrequencyTreatment} (${Number(b.lowFrequencyCutoffCm1)} cm⁻¹)`);
  }
  if (Number(a.frequencyScale) !== Number(b.frequencyScale)) out.push(`frequency scale ${Number(a.frequencyScale)} vs ${Number(b.frequencyScale)}`);
  return out;
}

function calcRules(data: LedgerData, link: ReturnType<typeof links>): Finding[] {
  const out: Finding[] = [];
  for (const [speciesId, calcs] of data.calcsBySpecies) {
    const sp = data.species.get(speciesId);
    if (!sp) continue;
    const obj = (c: CalcRow): AuditObject => ({ type: "calculation", id: c.id, label: `${sp.label} at ${data.levels.get(c.levelId)?.label ?? `level #${c.levelId}`} (#${c.id})` });
    const groups = new Map<string, CalcRow[]>();
    const comp = speciesComposition(sp);
    for (const c of calcs) {
      if (!c.converged) out.push({ severity: "warning", code: "not_converged", message: `${obj(c).label} is marked not converged`, object: obj(c), link: link.species(sp.id) });
      if (c.electronicEnergyText) {
        const k = `${c.levelId}:${c.conformerId ?? 0}`;
        groups.set(k, [...(groups.get(k) ?? []), c]);
        if (comp && !("error" in comp)) {
          try {
            const r = energyPlausibility(comp.counts, c.electronicEnergyText);
            if (!r.plausible) out.push({ severity: "error", code: "implausible_energy", message: `${obj(c).label}: ${r.message} (a rough plausibility check)`, object: obj(c), link: link.species(sp.id) });
          } catch {
            /* an unreadable formula is reported by the species rules */
          }
        }
      }
      const level = data.levels.get(c.levelId);
      // A method with its own built-in basis is not judged by basis-set rules of thumb.
      if (sp.charge < 0 && c.electronicEnergyText && level && level.basis !== BUILT_IN_BASIS) {
        try {
          if (classifyBasis(level.basis).diffuse === "none") {
            out.push({
              severity: "warning", code: "anion_without_diffuse",
              message: `${obj(c).label}: ${sp.label} is an anion (charge ${sp.charge}) computed with ${level.basis}, which has no diffuse functions (common practice: use an augmented basis such as def2-TZVPD, ma-def2-TZVP or 6-31+G(d) for anions)`,
              object: obj(c), link: link.species(sp.id),
            });
          }
        } catch {
          /* unknown basis names are not judged */
        }
      }
    }
    // Two calculations of one species (conformer) at one level that disagree by more than 1e-6 Eh (≈ 0.0006
    // kcal/mol): far below any chemically meaningful difference but above SCF round-off, so they are two
    // different results and the ledger's choice (the latest) is worth a look.
    for (const list of groups.values()) {
      if (list.length < 2) continue;
      const first = list[0]!;
      if (energiesDisagree(list)) {
        const last = list[list.length - 1]!;
        out.push({
          severity: "warning", code: "duplicates_disagree",
          message: `${list.length} calculations of ${sp.label} at ${data.levels.get(first.levelId)?.label} disagree (${list.map((c) => `#${c.id}: ${c.electronicEnergyText}`).join(", ")}); the ledger uses the latest, #${last.id}`,
          object: obj(last), link: link.species(sp.id),
        });
      }
    }
  }
  return out;
}

/**
 * The imaginary modes of a species, from its stored frequencies at the default protocol's thermal level
 * (else at any level): one entry per calculation with frequencies.
 */
function modeChecks(ctx: AuditContext, sp: SpeciesRow) {
  const { data } = ctx;
  const def = ctx.defaultProtocol;
  const lt = def ? (def.thermalLevelId ?? def.energyLevelId) : null;
  const withFreq = (data.calcsBySpecies.get(sp.id) ?? []).filter((c) => c.frequencyCount > 0);
  const atLt = withFreq.filter((c) => c.levelId === lt);
  const out: { c: CalcRow; imag: number[]; where: string }[] = [];
  for (const c of atLt.length ? atLt : withFreq) {
    const f = frequenciesOf(c);
    if (!f) continue;
    const where = `${data.levels.get(c.levelId)?.label ?? ""} (#${c.id}${c.conformerId ? `, conformer ${data.conformers.get(c.conformerId)?.label ?? c.conformerId}` : ""})`;
    out.push({ c, imag: f.filter((x) => x < 0), where });
  }
  return out;
}

const tsModesMessage = (sp: SpeciesRow, imag: number[], where: string) =>
  `Transition state ${sp.label} has ${imag.length} imaginary modes at ${where}${imag.length ? `: ${imag.join(", ")} cm⁻¹` : ""}; exactly one is needed`;

function speciesRules(ctx: AuditContext, link: ReturnType<typeof links>): Finding[] {
  const { data } = ctx;
  const out: Finding[] = [];
  for (const sp of data.species.values()) {
    const obj: AuditObject = { type: "species", id: sp.id, label: sp.label };
    const comp = speciesComposition(sp);
    if (comp && "error" in comp) out.push({ severity: "error", code: "formula_unreadable", message: `${sp.label}: ${comp.error}`, object: obj, link: link.species(sp.id) });
    if (comp && !("error" in comp)) {
      try {
        const n = electronCount(comp.counts, sp.charge);
        if (!isMultiplicityPossible(n, sp.multiplicity)) {
          out.push({
            severity: "error", code: "impossible_multiplicity",
            message: `${sp.label}: multiplicity ${sp.multiplicity} is impossible with ${n} electrons (${n % 2 === 0 ? "an even count needs 1, 3, 5 …" : "an odd count needs 2, 4, 6 …"})`,
            object: obj, link: link.species(sp.id),
          });
        }
      } catch (e) {
        out.push({ severity: "error", code: "impossible_charge", message: `${sp.label}: ${(e as Error).message}`, object: obj, link: link.species(sp.id) });
      }
    }
    const withFreq = (data.calcsBySpecies.get(sp.id) ?? []).filter((c) => c.frequencyCount > 0);
    if (sp.kind === "transition-state" && withFreq.length === 0) {
      out.push({ severity: "warning", code: "ts_no_frequencies", message: `Transition state ${sp.label} has no frequencies stored; its single imaginary mode cannot be checked`, object: obj, link: link.species(sp.id) });
    }
    for (const { imag, where } of modeChecks(ctx, sp)) {
      if (sp.kind === "transition-state" && imag.length !== 1) {
        out.push({ severity: "error", code: "ts_imaginary_modes", message: tsModesMessage(sp, imag, where), object: obj, link: link.species(sp.id) });
      }
      if (sp.kind === "minimum" && imag.length > 0) {
        out.push({
          severity: "warning", code: "minimum_imaginary",
          message: `${sp.label} is a minimum but has ${imag.length} imaginary mode(s) at ${where}: ${imag.join(", ")} cm⁻¹`,
          object: obj, link: link.species(sp.id),
        });
      }
    }
  }
  // Low-frequency modes without treatment, per species, under the protocols in use.
  for (const p of ctx.protocolsInUse) {
    const memo = ctx.speciesEvaluations.get(p.id);
    if (!memo || p.lowFrequencyTreatment !== "none") continue;
    for (const ev of memo.values()) {
      for (const prob of ev.problems.filter((x) => x.code === "low_frequency_untreated")) {
        out.push({ severity: "warning", code: "low_frequency_untreated", message: `${prob.message} (protocol ${p.name})`, object: { type: "species", id: ev.species.id, label: ev.species.label }, link: link.species(ev.species.id) });
      }
    }
  }
  return out;
}

function protocolRules(ctx: AuditContext, link: ReturnType<typeof links>): Finding[] {
  const { data } = ctx;
  const out: Finding[] = [];
  for (const p of data.protocols) {
    const obj: AuditObject = { type: "protocol", id: p.id, label: p.name };
    const le = data.levels.get(p.energyLevelId);
    const lt = data.levels.get(p.thermalLevelId ?? p.energyLevelId);
    if (le) {
      try {
        const b = classifyBasis(le.basis);
        if (b.zeta !== null && b.zeta <= 2) {
          out.push({
            severity: "warning", code: "double_zeta_energy",
            message: `Protocol ${p.name} takes its final energies from ${le.label}, a ${b.zeta === 1 ? "minimal" : "double-zeta"} basis (common practice: refine with single points in a triple-zeta basis or larger)`,
            object: obj, link: link.protocol(),
          });
        }
      } catch {
        /* unknown basis names are not judged */
      }
    }
    const solvated = [le, lt].find((l) => l?.solvationModel);
    if (solvated && p.standardState !== "1 M") {
      out.push({
        severity: "warning", code: "solution_gas_standard_state",
        message: `Protocol ${p.name} uses ${solvated.label} (implicit solvation) with the gas standard state ${p.standardState}; solution-phase free energies need the 1 M standard state (≈ +1.89 kcal/mol per species at 298.15 K)`,
        object: obj, link: link.protocol(),
      });
    }
    // Stored corrections at another temperature than the protocol's.
    const ltId = p.thermalLevelId ?? p.energyLevelId;
    const T = Number(p.temperatureK);
    const off: string[] = [];
    for (const calcs of data.calcsBySpecies.values()) {
      for (const c of calcs) {
        if (c.levelId === ltId && c.thermalTemperatureK !== null && Math.abs(Number(c.thermalTemperatureK) - T) > 0.005) {
          off.push(`${data.species.get(c.speciesId)?.label} (#${c.id}, ${Number(c.thermalTemperatureK)} K)`);
        }
      }
    }
    if (off.length) {
      out.push({
        severity: p.thermalSource === "stored" ? "error" : "note",
        code: "thermal_temperature_mismatch",
        message: `Protocol ${p.name} is at ${T} K but stored thermal corrections at ${lt?.label ?? ""} are for another temperature: ${off.slice(0, 12).join(", ")}${off.length > 12 ? ` and ${off.length - 12} more` : ""}; ${p.thermalSource === "stored" ? "they are not used, so those species get no H or G" : "the protocol computes from frequencies, so they are not used"}`,
        object: obj, link: link.protocol(),
      });
    }
  }
  // Protocols mixed: reactions and pathways pinned to protocols whose settings differ from the default's.
  const def = ctx.defaultProtocol;
  if (def) {
    const byId = new Map(data.protocols.map((p) => [p.id, p]));
    for (const r of ctx.reactionRows) {
      const p = r.protocolId ? byId.get(r.protocolId) : undefined;
      const diff = p && p.id !== def.id ? protocolDiffers(p, def) : [];
      if (diff.length) {
        out.push({
          severity: "warning", code: "protocol_mixed",
          message: `Reaction ${r.equation} is computed under protocol ${p!.name}, whose settings differ from the default ${def.name} (${diff.join("; ")}); its values do not compare with the other rows`,
          object: { type: "reaction", id: r.id, label: r.equation }, link: link.reaction(r.id),
        });
      }
    }
    for (const w of ctx.pathways) {
      const p = w.pathway.protocolId ? byId.get(w.pathway.protocolId) : undefined;
      const diff = p && p.id !== def.id ? protocolDiffers(p, def) : [];
      if (diff.length) {
        out.push({
          severity: "warning", code: "protocol_mixed",
          message: `Pathway ${w.pathway.name} is computed under protocol ${p!.name}, whose settings differ from the default ${def.name} (${diff.join("; ")})`,
          object: { type: "pathway", id: w.pathway.id, label: w.pathway.name }, link: link.pathway(w.pathway.id),
        });
      }
    }
  }
  return out;
}

const SEVERITY_ORDER: Record<Severity, number> = { error: 0, warning: 1, note: 2 };

/** Every finding of the project, errors first. */
export async function auditProject(projectId: number) {
  const ledger = await computeProjectLedger(projectId);
  const ctx: AuditContext = { ...ledger, projectId };
  const link = links(projectId);
  const findings: Finding[] = [];
  for (const r of ledger.reactions) findings.push(...fromProblems(r.problems, { type: "reaction", id: r.id, label: r.equation }, link.reaction(r.id)));
  for (const w of ledger.pathways) {
    findings.push(...fromProblems(w.problems.filter((p) => p.code !== "span_incomplete"), { type: "pathway", id: w.pathway.id, label: w.pathway.name }, link.pathway(w.pathway.id)));
  }
  findings.push(...speciesRules(ctx, link), ...calcRules(ledger.data, link), ...protocolRules(ctx, link));
  for (const rule of auditExtraRules) findings.push(...(await rule(ctx)));
  // The same problem reached through two rows is one finding per object.
  const seen = new Set<string>();
  const unique = findings.filter((f) => {
    const k = `${f.object.type}:${f.object.id}:${f.code}:${f.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
  unique.sort((a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity] || a.code.localeCompare(b.code) || a.object.label.localeCompare(b.object.label));
  const counts = { error: 0, warning: 0, note: 0 };
  for (const f of unique) counts[f.severity]++;
  return {
    defaultProtocol: ledger.defaultProtocol ? { id: ledger.defaultProtocol.id, name: ledger.defaultProtocol.name } : null,
    counts,
    totals: { species: ledger.data.species.size, reactions: ledger.reactions.length, pathways: ledger.pathways.length },
    findings: unique,
  };
}

// Registered when this module loads (the server build evaluates every route module, the audit route among them).
overviewCountProviders.push(async (project: Project) => {
  const audit = await auditProject(project.id);
  return [
    { key: "species", label: "Species", value: audit.totals.species },
    { key: "reactions", label: "Reactions", value: audit.totals.reactions },
    { key: "audit-errors", label: "Audit errors", value: audit.counts.error },
    { key: "audit-warnings", label: "Audit warnings", value: audit.counts.warning },
  ];
});

/**
 * The audit's errors on the calculations grid: a cell (species × level) is marked when a reaction or
 * pathway error names that species at that level (a missing single point, levels mixed, missing
 * frequencies …), and a transition state's cell when its stored frequencies do not show exactly one
 * imaginary mode. Same computation as the audit, so the grid and the audit never disagree.
 */
export async function auditCellFlags(projectId: number): Promise<Map<string, CellFlag[]>> {
  const ledger = await computeProjectLedger(projectId);
  const ctx: AuditContext = { ...ledger, projectId };
  const { data } = ledger;
  const levelByLabel = new Map([...data.levels.values()].map((l) => [l.label, l.id]));
  const out = new Map<string, CellFlag[]>();
  const seen = new Set<string>();
  const add = (key: string, flag: CellFlag) => {
    const k = `${key}|${flag.message}`;
    if (seen.has(k)) return;
    seen.add(k);
    const list = out.get(key) ?? [];
    // A species used by many reactions: the first few say enough.
    if (list.filter((f) => f.code === flag.code).length < 3) out.set(key, [...list, flag]);
  };
  const rows = [
    ...ledger.reactions.map((r) => ({ what: `Reaction ${r.equation}`, problems: r.problems })),
    ...ledger.pathways.map((w) => ({ what: `Pathway ${w.pathway.name}`, problems: w.problems })),
  ];
  for (const { what, problems } of rows) {
    for (const p of problems) {
      if (p.severity !== "error" || !p.species || !p.level) continue;
      const sp = data.speciesByLabel.get(p.species);
      const levelId = levelByLabel.get(p.level);
      if (!sp || levelId === undefined) continue;
      add(`${sp.id}:${levelId}`, { code: p.code, severity: "error", message: `${what}: ${p.message}` });
    }
  }
  for (const sp of data.species.values()) {
    if (sp.kind !== "transition-state") continue;
    for (const { c, imag, where } of modeChecks(ctx, sp)) {
      if (imag.length === 1) continue;
      add(`${sp.id}:${c.levelId}`, { code: "ts_imaginary_modes", severity: "error", message: tsModesMessage(sp, imag, where) });
    }
  }
  return out;
}
