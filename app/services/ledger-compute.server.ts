import { QueryTypes } from "sequelize";
import { db } from "../../db";
import {
  ThermoInputError, barrierDelta, boltzmannPopulations, checkBalance, computeThermochemistry, energeticSpan, energy, energyIn,
  ensembleFreeEnergy, equilibriumConstant, eyringRate, formatLevel, formulaFromSmiles, parseEnergyUnit, parseFormula,
  profileBarriers, reactionDelta, resolveStandardState, speciesEnergies, sumHartree, convertEnergy,
} from "../domain/thermo";
import type { Delta, EnergyUnit, HartreeDecimal, ParsedFormula, SpeciesEnergies, StandardState } from "../domain/thermo";
import { ServiceError } from "../utils/http.server";

/**
 * The ledger computation: per-species values under one protocol, then reactions and pathways.
 *
 * Consistency is enforced here, not suggested: a value is computed only from calculations at the
 * protocol's energy level (E) and thermal level (corrections), under the protocol's settings, for every
 * species of the row; otherwise it is null and a problem names the species, the level and the missing or
 * mismatched item. Aliased levels share one Level row (canonical key), so "same level" is "same id".
 * Every number comes from app/domain/thermo; this module only chooses inputs and reports.
 *
 * Speed: everything is read in a handful of queries (no per-row queries). Frequencies and geometries are
 * the bulk of the data, so the first read takes only their sizes; the blobs are fetched for cache misses
 * only, and RRHO results are cached in memory by (calculation id, version, species/conformer version,
 * protocol settings). An edit bumps the row's version and so misses the cache by itself.
 */

export type Problem = {
  code: string;
  message: string;
  severity: "error" | "warning";
  species?: string;
  level?: string;
};
export type ReactionStatus = "ok" | "incomplete" | "inconsistent" | "unbalanced" | "invalid";
export type ValueKey = "deltaE" | "deltaEZPE" | "deltaH" | "deltaG" | "barrierE" | "barrierG" | "rateConstant" | "equilibriumConstant";
type Kind = "E" | "EZPE" | "H" | "G";
const KINDS: Kind[] = ["E", "EZPE", "H", "G"];

// ---------------------------------------------------------------- rows as read
export type LevelRow = { id: number; key: string; method: string; basis: string; dispersion: string | null; solvationModel: string | null; solvent: string | null; label: string };
export type SpeciesRow = {
  id: number; label: string; formula: string | null; smiles: string | null; charge: number; multiplicity: number;
  kind: "minimum" | "transition-state"; symmetryNumber: number; concentrationMolL: string | null; version: number; geometryLength: number;
};
export type ConformerRow = { id: number; speciesId: number; label: string; version: number; geometryLength: number };
export type CalcRow = {
  id: number; speciesId: number; conformerId: number | null; levelId: number; electronicEnergyText: string | null;
  /** 1 when frequencies are stored (the list itself is read only on a cache miss), else 0. */
  frequencyCount: number; thermalTemperatureK: string | null; zpeHartree: string | null; enthalpyCorrectionHartree: string | null;
  gibbsCorrectionHartree: string | null; converged: boolean; version: number; updatedAt: string;
};
export type ProtocolRow = {
  id: number; name: string; energyLevelId: number; thermalLevelId: number | null; thermalSource: "computed" | "stored";
  temperatureK: string; standardState: StandardState; lowFrequencyTreatment: "none" | "grimme" | "truhlar";
  lowFrequencyCutoffCm1: string; frequencyScale: string; conformerTreatment: "lowest" | "boltzmann"; version: number;
};

export type LedgerData = {
  projectId: number;
  defaultProtocolId: number | null;
  levels: Map<number, LevelRow>;
  species: Map<number, SpeciesRow>;
  speciesByLabel: Map<string, SpeciesRow>;
  conformers: Map<number, ConformerRow>;
  calcsBySpecies: Map<number, CalcRow[]>;
  protocols: ProtocolRow[];
};

function levelLabel(l: { method: string; basis: string; dispersion: string | null; solvationModel: string | null; solvent: string | null; key: string }): string {
  try {
    return formatLevel({ method: l.method, basis: l.basis, dispersion: l.dispersion, solvation: l.solvationModel && l.solvent ? { model: l.solvationModel, solvent: l.solvent } : null });
  } catch {
    return l.key;
  }
}

/** Everything the computation needs for one project, in a few queries (frequencies and geometries are not read here). */
export async function loadLedgerData(projectId: number): Promise<LedgerData> {
  const { sequelize } = db();
  const q = <T extends object>(sql: string): Promise<T[]> => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements: { projectId } });
  const [project, levels, species, conformers, calcs, protocols] = await Promise.all([
    q<{ defaultProtocolId: number | null }>("SELECT default_protocol_id AS defaultProtocolId FROM projects WHERE id = :projectId"),
    q<Omit<LevelRow, "label">>(
      "SELECT id, `key`, method, basis, dispersion, solvation_model AS solvationModel, solvent FROM levels WHERE project_id = :projectId",
    ),
    q<SpeciesRow>(
      `SELECT id, label, formula, smiles, charge, multiplicity, kind, symmetry_number AS symmetryNumber,
              concentration_mol_l AS concentrationMolL, version, (geometry_xyz IS NOT NULL) AS geometryLength
         FROM species WHERE project_id = :projectId`,
    ),
    q<ConformerRow>(
      `SELECT c.id, c.species_id AS speciesId, c.label, c.version, (c.geometry_xyz IS NOT NULL) AS geometryLength
         FROM conformers c JOIN species s ON s.id = c.species_id WHERE s.project_id = :projectId`,
    ),
    q<CalcRow>(
      `SELECT id, species_id AS speciesId, conformer_id AS conformerId, level_id AS levelId,
              electronic_energy_text AS electronicEnergyText, (frequencies IS NOT NULL) AS frequencyCount,
              thermal_temperature_k AS thermalTemperatureK, zpe_hartree AS zpeHartree,
              enthalpy_correction_hartree AS enthalpyCorrectionHartree, gibbs_correction_hartree AS gibbsCorrectionHartree,
              converged, version, updated_at AS updatedAt
         FROM calculations WHERE project_id = :projectId ORDER BY id`,
    ),
    q<ProtocolRow>(
      `SELECT id, name, energy_level_id AS energyLevelId, thermal_level_id AS thermalLevelId, thermal_source AS thermalSource,
              temperature_k AS temperatureK, standard_state AS standardState, low_frequency_treatment AS lowFrequencyTreatment,
              low_frequency_cutoff_cm1 AS lowFrequencyCutoffCm1, frequency_scale AS frequencyScale,
              conformer_treatment AS conformerTreatment, version
         FROM protocols WHERE project_id = :projectId ORDER BY id`,
    ),
  ]);
  if (!project[0]) throw new ServiceError(404, "not_found", "No such project");
  const data: LedgerData = {
    projectId,
    defaultProtocolId: project[0].defaultProtocolId ?? null,
    levels: new Map(levels.map((l) => [l.id, { ...l, label: levelLabel(l) }])),
    species: new Map(),
    speciesByLabel: new Map(),
    conformers: new Map(conformers.map((c) => [c.id, { ...c, geometryLength: Number(c.geometryLength) }])),
    calcsBySpecies: new Map(),
    protocols,
  };
  for (const s of species) {
    const row = { ...s, geometryLength: Number(s.geometryLength) };
    data.species.set(s.id, row);
    data.speciesByLabel.set(s.label, row);
  }
  for (const c of calcs) {
    c.converged = Boolean(c.converged);
    c.frequencyCount = Number(c.frequencyCount);
    const list = data.calcsBySpecies.get(c.speciesId);
    if (list) list.push(c);
    else data.calcsBySpecies.set(c.speciesId, [c]);
  }
  return data;
}

// ---------------------------------------------------------------- caches (per process)
const MAX_CACHE = 50_000;
const frequencyCache = new Map<string, number[]>(); // `${calcId}:${version}`
const geometryCache = new Map<string, string>(); // `s${id}:${version}` | `c${id}:${version}`
type ThermoSummary = {
  zpe: number; enthalpyCorrection: number; gibbsCorrection: number; entropy: number;
  imaginary: number[]; lowModes: number[]; warnings: string[]; description: string;
};
const thermoCache = new Map<string, ThermoSummary | { error: string }>();
const formulaCache = new Map<string, ParsedFormula | { error: string }>(); // `${speciesId}:${version}`

function put<K, V>(map: Map<K, V>, key: K, value: V) {
  if (map.size >= MAX_CACHE) map.clear();
  map.set(key, value);
}

/** Empties the in-memory caches (tests and the bench use it to measure a cold start). */
export function clearLedgerCaches() {
  frequencyCache.clear();
  geometryCache.clear();
  thermoCache.clear();
  formulaCache.clear();
}

const freqKey = (c: CalcRow) => `${c.id}:${c.version}`;
const geomKey = (sp: SpeciesRow, conf: ConformerRow | null) => (conf && conf.geometryLength > 0 ? `c${conf.id}:${conf.version}` : `s${sp.id}:${sp.version}`);

/** Fetches the frequencies and geometries that the caches do not hold yet, in two queries. */
async function fillBlobs(data: LedgerData, calcs: CalcRow[], geometries: Array<{ sp: SpeciesRow; conf: ConformerRow | null }>) {
  const { sequelize } = db();
  const needF = calcs.filter((c) => c.frequencyCount > 0 && !frequencyCache.has(freqKey(c)));
  const needS = new Map<number, SpeciesRow>();
  const needC = new Map<number, ConformerRow>();
  for (const g of geometries) {
    const key = geomKey(g.sp, g.conf);
    if (geometryCache.has(key)) continue;
    if (g.conf && g.conf.geometryLength > 0) needC.set(g.conf.id, g.conf);
    else if (g.sp.geometryLength > 0) needS.set(g.sp.id, g.sp);
  }
  const jobs: Promise<void>[] = [];
  const chunks = <T>(a: T[], n = 2000) => Array.from({ length: Math.ceil(a.length / n) }, (_, i) => a.slice(i * n, i * n + n));
  for (const part of chunks(needF)) {
    jobs.push(
      sequelize
        .query<{ id: number; version: number; frequencies: string | number[] }>(
          "SELECT id, version, frequencies FROM calculations WHERE project_id = :projectId AND id IN (:ids)",
          { type: QueryTypes.SELECT, replacements: { projectId: data.projectId, ids: part.map((c) => c.id) } },
        )
        .then((rows) => {
          for (const r of rows) {
            const list = typeof r.frequencies === "string" ? (JSON.parse(r.frequencies) as number[]) : r.frequencies;
            put(frequencyCache, `${r.id}:${r.version}`, Array.isArray(list) ? list.map(Number) : []);
          }
        }),
    );
  }
  for (const part of chunks([...needS.values()])) {
    jobs.push(
      sequelize
        .query<{ id: number; version: number; geometryXyz: string }>(
          "SELECT id, version, geometry_xyz AS geometryXyz FROM species WHERE project_id = :projectId AND id IN (:ids)",
          { type: QueryTypes.SELECT, replacements: { projectId: data.projectId, ids: part.map((s) => s.id) } },
        )
        .then((rows) => rows.forEach((r) => r.geometryXyz && put(geometryCache, `s${r.id}:${r.version}`, r.geometryXyz))),
    );
  }
  for (const part of chunks([...needC.values()])) {
    jobs.push(
      sequelize
        .query<{ id: number; version: number; geometryXyz: string }>(
          "SELECT id, version, geometry_xyz AS geometryXyz FROM conformers WHERE id IN (:ids)",
          { type: QueryTypes.SELECT, replacements: { ids: part.map((s) => s.id) } },
        )
        .then((rows) => rows.forEach((r) => r.geometryXyz && put(geometryCache, `c${r.id}:${r.version}`, r.geometryXyz))),
    );
  }
  await Promise.all(jobs);
}

/** The element counts of a species (formula, else SMILES) with its stored charge; null when it has neither. */
export function speciesComposition(sp: SpeciesRow): ParsedFormula | { error: string } | null {
  if (!sp.formula && !sp.smiles) return null;
  const key = `${sp.id}:${sp.version}`;
  let hit = formulaCache.get(key);
  if (!hit) {
    try {
      const parsed = sp.formula ? parseFormula(sp.formula) : formulaFromSmiles(sp.smiles!);
      hit = { counts: parsed.counts, charge: sp.charge };
    } catch (e) {
      hit = { error: e instanceof Error ? e.message : String(e) };
    }
    put(formulaCache, key, hit);
  }
  return hit;
}

/** Stored frequencies of a calculation (after fillBlobs), or null when it has none. */
export function frequenciesOf(c: CalcRow): number[] | null {
  if (c.frequencyCount === 0) return null;
  const list = frequencyCache.get(freqKey(c));
  return list && list.length ? list : null;
}

// ---------------------------------------------------------------- protocols
export function protocolSettingsKey(p: ProtocolRow): string {
  return [p.energyLevelId, p.thermalLevelId ?? p.energyLevelId, p.thermalSource, Number(p.temperatureK), p.standardState, p.lowFrequencyTreatment,
    Number(p.lowFrequencyCutoffCm1), Number(p.frequencyScale), p.conformerTreatment].join("|");
}

/** The protocol as the API shows it. */
export function describeProtocolRow(data: LedgerData, p: ProtocolRow) {
  const energyLevel = data.levels.get(p.energyLevelId);
  const thermalLevel = data.levels.get(p.thermalLevelId ?? p.energyLevelId);
  return {
    id: p.id,
    name: p.name,
    energyLevel: energyLevel ? { id: energyLevel.id, key: energyLevel.key, label: energyLevel.label } : null,
    thermalLevel: thermalLevel ? { id: thermalLevel.id, key: thermalLevel.key, label: thermalLevel.label } : null,
    notation: energyLevel && thermalLevel && thermalLevel.id !== energyLevel.id ? `${energyLevel.label} // ${thermalLevel.label}` : (energyLevel?.label ?? ""),
    thermalSource: p.thermalSource,
    temperatureK: Number(p.temperatureK),
    standardState: p.standardState,
    lowFrequency: { treatment: p.lowFrequencyTreatment, cutoff: Number(p.lowFrequencyCutoffCm1) },
    frequencyScale: Number(p.frequencyScale),
    conformerTreatment: p.conformerTreatment,
    isDefault: defaultProtocolOf(data)?.id === p.id,
  };
}
export type ProtocolSummary = ReturnType<typeof describeProtocolRow>;

export function defaultProtocolOf(data: LedgerData): ProtocolRow | null {
  return data.protocols.find((p) => p.id === data.defaultProtocolId) ?? data.protocols[0] ?? null;
}

/** A protocol by id or name (the `?protocol=` of the API); none given: the project's default. */
export function pickProtocol(data: LedgerData, ref: string | number | null | undefined): ProtocolRow | null {
  if (ref === undefined || ref === null || ref === "") return defaultProtocolOf(data);
  const text = String(ref).trim();
  const found = (/^\d+$/.test(text) ? data.protocols.find((p) => p.id === Number(text)) : undefined) ?? data.protocols.find((p) => p.name === text);
  if (!found) {
    throw new ServiceError(422, "unknown_protocol", `No protocol ${JSON.stringify(text)} in this project`, [
      { field: "protocol", message: `known: ${data.protocols.map((p) => p.name).join(", ") || "none yet"}` },
    ]);
  }
  return found;
}

export function parseUnit(text: string | null | undefined): EnergyUnit {
  if (!text) return "kcal/mol";
  try {
    const unit = parseEnergyUnit(text, "unit");
    if (unit === "J/mol") throw new ThermoInputError("unit", "J/mol is not offered");
    return unit;
  } catch (e) {
    throw new ServiceError(400, "invalid_unit", `Unknown unit ${JSON.stringify(text)}; use kcal/mol, kJ/mol, eV, cm-1 or hartree`, [
      { field: "unit", message: e instanceof Error ? e.message : "unknown unit" },
    ]);
  }
}

// ---------------------------------------------------------------- one species under a protocol
export type MemberUse = {
  conformer: string | null;
  energyCalculationId: number | null;
  thermalCalculationId: number | null;
  electronicEnergy: string | null;
  zpe: number | null;
  enthalpyCorrection: number | null;
  gibbsCorrection: number | null;
  standardStateCorrection: number;
  thermalSource: "computed" | "stored" | null;
  lowFrequency?: string;
  imaginaryFrequencies: number[] | null;
  population?: number;
  energies: SpeciesEnergies | null;
};
export type SpeciesEval = {
  species: SpeciesRow;
  energies: Record<Kind, HartreeDecimal | null>;
  /** Why each kind is missing (empty when it is available). */
  missing: Record<Kind, Problem[]>;
  /** Warnings and errors that concern this species whatever the kind. */
  problems: Problem[];
  members: MemberUse[];
  /** Imaginary modes at the thermal level, per member; null when no frequencies are stored. */
  imaginary: number[] | null;
  treatment: "single" | "lowest" | "boltzmann";
};

type EvalContext = { data: LedgerData; protocol: ProtocolRow; memo: Map<number, SpeciesEval> };

function latest<T extends CalcRow>(list: T[]): T | null {
  return list.length ? list[list.length - 1]! : null;
}

/** Collects what must be fetched (frequencies, geometries) for these species under this protocol. */
function blobsNeeded(ctx: EvalContext, speciesIds: Iterable<number>) {
  const calcs: CalcRow[] = [];
  const geoms: Array<{ sp: SpeciesRow; conf: ConformerRow | null }> = [];
  const lt = ctx.protocol.thermalLevelId ?? ctx.protocol.energyLevelId;
  for (const id of speciesIds) {
    const sp = ctx.data.species.get(id);
    if (!sp) continue;
    for (const c of ctx.data.calcsBySpecies.get(id) ?? []) {
      if (c.levelId !== lt || c.frequencyCount === 0) continue;
      calcs.push(c);
      const conf = c.conformerId ? (ctx.data.conformers.get(c.conformerId) ?? null) : null;
      if (ctx.protocol.thermalSource === "computed" && !thermoCache.has(thermoKey(ctx.protocol, sp, conf, c))) geoms.push({ sp, conf });
    }
  }
  // Calculations whose RRHO result is cached need no frequencies either, except for the TS check.
  return { calcs: calcs.filter((c) => !frequencyCache.has(freqKey(c))), geoms };
}

function thermoKey(p: ProtocolRow, sp: SpeciesRow, conf: ConformerRow | null, c: CalcRow): string {
  return `${c.id}:${c.version}|${sp.id}:${sp.version}|${conf ? `${conf.id}:${conf.version}` : "-"}|${Number(p.temperatureK)}|${p.standardState}|${p.lowFrequencyTreatment}|${Number(p.lowFrequencyCutoffCm1)}|${Number(p.frequencyScale)}`;
}

function rrho(ctx: EvalContext, sp: SpeciesRow, conf: ConformerRow | null, c: CalcRow, pressurePa: number): ThermoSummary | { error: string } {
  const key = thermoKey(ctx.protocol, sp, conf, c);
  const hit = thermoCache.get(key);
  if (hit) return hit;
  const freqs = frequenciesOf(c);
  const geometry = geometryCache.get(geomKey(sp, conf));
  let out: ThermoSummary | { error: string };
  if (!freqs) out = { error: "no frequencies stored" };
  else if (!geometry) out = { error: `no geometry stored for ${conf ? `conformer ${conf.label} of ` : ""}${sp.label} (needed for masses and moments of inertia)` };
  else {
    try {
      const r = computeThermochemistry({
        frequenciesCm1: freqs,
        geometry,
        symmetryNumber: sp.symmetryNumber,
        multiplicity: sp.multiplicity,
        charge: sp.charge,
        temperatureK: Number(ctx.protocol.temperatureK),
        pressurePa,
        frequencyScale: Number(ctx.protocol.frequencyScale),
        lowFrequency: { treatment: ctx.protocol.lowFrequencyTreatment, cutoffCm1: Number(ctx.protocol.lowFrequencyCutoffCm1) },
        perMode: false,
      });
      out = {
        zpe: r.zpe, enthalpyCorrection: r.enthalpyCorrection, gibbsCorrection: r.gibbsCorrection, entropy: r.entropy,
        imaginary: r.imaginaryFrequencies, lowModes: r.lowFrequency.affectedFrequenciesCm1, warnings: r.warnings, description: r.lowFrequency.description,
      };
    } catch (e) {
      out = { error: e instanceof Error ? e.message : String(e) };
    }
  }
  put(thermoCache, key, out);
  return out;
}

function emptyMissing(): Record<Kind, Problem[]> {
  return { E: [], EZPE: [], H: [], G: [] };
}

function evaluateSpecies(ctx: EvalContext, speciesId: number): SpeciesEval | null {
  const memo = ctx.memo.get(speciesId);
  if (memo) return memo;
  const sp = ctx.data.species.get(speciesId);
  if (!sp) return null;
  const { data, protocol: p } = ctx;
  const le = p.energyLevelId;
  const lt = p.thermalLevelId ?? le;
  const leRow = data.levels.get(le);
  const ltRow = data.levels.get(lt);
  const leLabel = leRow?.label ?? `level #${le}`;
  const ltLabel = ltRow?.label ?? `level #${lt}`;
  const T = Number(p.temperatureK);
  const calcs = data.calcsBySpecies.get(speciesId) ?? [];
  const missing = emptyMissing();
  const problems: Problem[] = [];
  const addMissing = (kinds: Kind[], prob: Problem) => kinds.forEach((k) => missing[k].push(prob));

  // Members: the conformers that have an energy at the energy level, else the species itself.
  const atLe = calcs.filter((c) => c.levelId === le && c.electronicEnergyText);
  const confIds = [...new Set(atLe.filter((c) => c.conformerId !== null).map((c) => c.conformerId as number))];
  const memberConfs: Array<ConformerRow | null> = confIds.length ? confIds.map((id) => data.conformers.get(id) ?? null).filter((c) => c !== null) : [null];

  let ss: { pressurePa: number; correctionHartree: number; description: string };
  try {
    const conc = p.standardState === "1 M" && sp.concentrationMolL !== null ? Number(sp.concentrationMolL) : undefined;
    ss = resolveStandardState(p.standardState, T, conc);
  } catch (e) {
    ss = { pressurePa: 101325, correctionHartree: 0, description: "" };
    addMissing(["G"], { code: "standard_state", severity: "error", species: sp.label, message: `${sp.label}: ${(e as Error).message}` });
  }

  const members: MemberUse[] = [];
  let anyFreq = false;
  const imaginaryAll: number[] = [];
  for (const conf of memberConfs) {
    const confId = conf?.id ?? null;
    const who = conf ? `${sp.label} (conformer ${conf.label})` : sp.label;
    const eCalc = latest(atLe.filter((c) => c.conformerId === confId));
    const member: MemberUse = {
      conformer: conf?.label ?? null, energyCalculationId: eCalc?.id ?? null, thermalCalculationId: null,
      electronicEnergy: eCalc?.electronicEnergyText ?? null, zpe: null, enthalpyCorrection: null, gibbsCorrection: null,
      standardStateCorrection: ss.correctionHartree, thermalSource: null, imaginaryFrequencies: null, energies: null,
    };
    if (!eCalc) {
      const elsewhere = [...new Set(calcs.filter((c) => c.electronicEnergyText && c.levelId !== le).map((c) => data.levels.get(c.levelId)?.label ?? `#${c.levelId}`))];
      if (elsewhere.length) {
        addMissing(KINDS, {
          code: "level_mismatch", severity: "error", species: sp.label, level: leLabel,
          message: `${who} has no electronic energy at ${leLabel} (the protocol's energy level), only at ${elsewhere.join(", ")}; energies from different levels are never combined — add a calculation at ${leLabel} or choose another protocol`,
        });
      } else {
        addMissing(KINDS, {
          code: "missing_calculation", severity: "error", species: sp.label, level: leLabel,
          message: `${who} has no electronic energy at ${leLabel}`,
        });
      }
    }
    // thermal corrections
    const atLt = calcs.filter((c) => c.levelId === lt && c.conformerId === confId);
    const freqCalc = latest(atLt.filter((c) => c.frequencyCount > 0));
    if (freqCalc) {
      anyFreq = true;
      const f = frequenciesOf(freqCalc);
      if (f) {
        const imag = f.filter((x) => x < 0);
        member.imaginaryFrequencies = imag;
        imaginaryAll.push(...imag);
      }
    }
    if (p.thermalSource === "computed") {
      if (!freqCalc) {
        const storedHere = atLt.find((c) => c.thermalTemperatureK !== null);
        addMissing(["EZPE", "H", "G"], {
          code: "missing_frequencies", severity: "error", species: sp.label, level: ltLabel,
          message: `${who} has no frequencies at ${ltLabel} (the protocol's thermal level), so ZPE, H and G cannot be computed${storedHere ? `; it has stored corrections at ${Number(storedHere.thermalTemperatureK)} K, which a protocol with thermal source "stored" at that temperature would use` : ""}`,
        });
      } else {
        member.thermalCalculationId = freqCalc.id;
        member.thermalSource = "computed";
        const r = rrho(ctx, sp, conf, freqCalc, ss.pressurePa);
        if ("error" in r) {
          addMissing(["EZPE", "H", "G"], { code: "thermochemistry_failed", severity: "error", species: sp.label, level: ltLabel, message: `${who}: thermal corrections at ${ltLabel} cannot be computed: ${r.error}` });
        } else {
          member.zpe = r.zpe;
          member.enthalpyCorrection = r.enthalpyCorrection;
          member.gibbsCorrection = r.gibbsCorrection;
          member.lowFrequency = r.description;
          if (p.lowFrequencyTreatment === "none" && r.lowModes.length) {
            problems.push({
              code: "low_frequency_untreated", severity: "warning", species: sp.label, level: ltLabel,
              message: `${who}: ${r.lowModes.length} mode(s) below ${Number(p.lowFrequencyCutoffCm1)} cm⁻¹ treated as harmonic oscillators (no low-frequency treatment); entropies may be overestimated`,
            });
          }
        }
      }
    } else {
      const stored = latest(atLt.filter((c) => c.thermalTemperatureK !== null && c.gibbsCorrectionHartree !== null));
      if (!stored) {
        addMissing(["EZPE", "H", "G"], { code: "missing_thermal", severity: "error", species: sp.label, level: ltLabel, message: `${who} has no stored thermal corrections at ${ltLabel}` });
      } else if (Math.abs(Number(stored.thermalTemperatureK) - T) > 0.005) {
        addMissing(["EZPE", "H", "G"], {
          code: "thermal_temperature_mismatch", severity: "error", species: sp.label, level: ltLabel,
          message: `${who}: stored thermal corrections at ${ltLabel} are for ${Number(stored.thermalTemperatureK)} K, the protocol is at ${T} K; they are not used${freqCalc ? " (a protocol computing from the stored frequencies would work at any temperature)" : ""}`,
        });
      } else {
        member.thermalCalculationId = stored.id;
        member.thermalSource = "stored";
        member.zpe = stored.zpeHartree !== null ? Number(stored.zpeHartree) : null;
        member.enthalpyCorrection = stored.enthalpyCorrectionHartree !== null ? Number(stored.enthalpyCorrectionHartree) : null;
        member.gibbsCorrection = Number(stored.gibbsCorrectionHartree);
        if (member.zpe === null) addMissing(["EZPE"], { code: "missing_zpe", severity: "error", species: sp.label, level: ltLabel, message: `${who}: no ZPE among the stored corrections at ${ltLabel}` });
        if (member.enthalpyCorrection === null) addMissing(["H"], { code: "missing_enthalpy", severity: "error", species: sp.label, level: ltLabel, message: `${who}: no enthalpy correction among the stored corrections at ${ltLabel}` });
      }
    }
    if (eCalc && !eCalc.converged) problems.push({ code: "not_converged", severity: "warning", species: sp.label, level: leLabel, message: `${who}: the calculation at ${leLabel} is marked not converged` });
    if (member.electronicEnergy) {
      try {
        member.energies = speciesEnergies({
          electronicEnergy: member.electronicEnergy, zpe: member.zpe, enthalpyCorrection: member.enthalpyCorrection,
          gibbsCorrection: member.gibbsCorrection, standardStateCorrection: member.standardStateCorrection,
        }, sp.label);
      } catch (e) {
        addMissing(KINDS, { code: "invalid_energy", severity: "error", species: sp.label, level: leLabel, message: `${who}: ${(e as Error).message}` });
      }
    }
    members.push(member);
  }

  // Combine members: one species, lowest conformer, or Boltzmann ensemble (protocol's choice).
  const energies: Record<Kind, HartreeDecimal | null> = { E: null, EZPE: null, H: null, G: null };
  let treatment: SpeciesEval["treatment"] = "single";
  const usable = members.filter((m) => m.energies);
  if (members.length === 1) {
    const e = members[0]!.energies;
    if (e) for (const k of KINDS) energies[k] = e[k];
  } else if (usable.length === members.length && usable.length > 0) {
    const allG = usable.every((m) => m.energies!.G);
    if (p.conformerTreatment === "boltzmann" && allG) {
      treatment = "boltzmann";
      const gs = usable.map((m) => m.energies!.G!.toString());
      const pops = boltzmannPopulations(gs, T);
      usable.forEach((m, i) => (m.population = pops[i]));
      energies.G = sumHartree([{ coefficient: 1, energyHartree: ensembleFreeEnergy(gs, T) }]);
      for (const k of ["E", "EZPE", "H"] as Kind[]) {
        if (usable.every((m) => m.energies![k])) energies[k] = sumHartree(usable.map((m, i) => ({ coefficient: pops[i]!, energyHartree: m.energies![k]! })));
      }
    } else {
      treatment = "lowest";
      const by: Kind = allG ? "G" : "E";
      let best = usable[0]!;
      for (const m of usable) if (m.energies![by]!.lt(best.energies![by]!)) best = m;
      best.population = 1;
      for (const k of KINDS) energies[k] = best.energies![k];
      if (p.conformerTreatment === "boltzmann") {
        addMissing(["G"], { code: "ensemble_incomplete", severity: "error", species: sp.label, message: `${sp.label}: a Boltzmann ensemble needs G for every conformer` });
      }
    }
  }
  for (const k of KINDS) if (missing[k].length) energies[k] = null;

  if (!anyFreq && sp.kind === "transition-state") {
    problems.push({ code: "ts_no_frequencies", severity: "warning", species: sp.label, level: ltLabel, message: `Transition state ${sp.label} has no frequencies stored at ${ltLabel}; its single imaginary mode cannot be checked` });
  }
  const result: SpeciesEval = { species: sp, energies, missing, problems, members, imaginary: anyFreq ? imaginaryAll : null, treatment };
  ctx.memo.set(speciesId, result);
  return result;
}

/** Evaluates many species at once: fetches the missing blobs in one go, then computes. */
async function evaluateAll(data: LedgerData, protocol: ProtocolRow, speciesIds: Iterable<number>): Promise<EvalContext> {
  const ctx: EvalContext = { data, protocol, memo: new Map() };
  const ids = [...new Set(speciesIds)];
  const { calcs, geoms } = blobsNeeded(ctx, ids);
  if (calcs.length || geoms.length) await fillBlobs(data, calcs, geoms);
  for (const id of ids) evaluateSpecies(ctx, id);
  return ctx;
}

// ---------------------------------------------------------------- reactions
export type ReactionRow = { id: number; equation: string; transitionStateId: number | null; protocolId: number | null; notes: string; version: number };
export type TermRow = { reactionId: number; speciesId: number; side: "reactant" | "product"; coefficient: string; position: number };

export async function loadReactionRows(projectId: number, reactionId?: number) {
  const { sequelize } = db();
  const filter = reactionId ? " AND r.id = :reactionId" : "";
  const [reactions, terms] = await Promise.all([
    sequelize.query<ReactionRow>(
      `SELECT r.id, r.equation, r.transition_state_id AS transitionStateId, r.protocol_id AS protocolId, r.notes, r.version
         FROM reactions r WHERE r.project_id = :projectId${filter} ORDER BY r.id`,
      { type: QueryTypes.SELECT, replacements: { projectId, reactionId } },
    ),
    sequelize.query<TermRow>(
      `SELECT t.reaction_id AS reactionId, t.species_id AS speciesId, t.side, t.coefficient, t.position
         FROM reaction_terms t JOIN reactions r ON r.id = t.reaction_id WHERE r.project_id = :projectId${filter} ORDER BY t.reaction_id, t.position`,
      { type: QueryTypes.SELECT, replacements: { projectId, reactionId } },
    ),
  ]);
  const termsBy = new Map<number, TermRow[]>();
  for (const t of terms) {
    const list = termsBy.get(t.reactionId);
    if (list) list.push(t);
    else termsBy.set(t.reactionId, [t]);
  }
  return { reactions, termsBy };
}

type Values = Record<ValueKey, number | null>;
type TermEval = { side: "reactant" | "product" | "transition-state"; coefficient: number; species: SpeciesRow | null; eval: SpeciesEval | null };

const STATUS_ORDER: ReactionStatus[] = ["invalid", "unbalanced", "inconsistent", "incomplete", "ok"];
const INCONSISTENT = new Set(["level_mismatch", "thermal_temperature_mismatch", "protocol_mismatch", "standard_state", "ensemble_incomplete"]);

function dedupe(problems: Problem[]): Problem[] {
  const seen = new Set<string>();
  return problems.filter((p) => {
    const k = `${p.code}|${p.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

function statusOf(problems: Problem[]): ReactionStatus {
  let best: ReactionStatus = "ok";
  for (const p of problems) {
    if (p.severity !== "error") continue;
    const s: ReactionStatus = p.code === "unbalanced" ? "unbalanced" : p.code.startsWith("ts_") || p.code === "invalid_energy" || p.code === "unknown_species" ? "invalid" : INCONSISTENT.has(p.code) ? "inconsistent" : "incomplete";
    if (STATUS_ORDER.indexOf(s) < STATUS_ORDER.indexOf(best)) best = s;
  }
  return best;
}

/** Balance of reactants against products (and the TS against the reactants); problems name what is off. */
function balanceProblems(terms: TermEval[], what: string): Problem[] {
  const out: Problem[] = [];
  const unknown: string[] = [];
  const side = (s: "reactant" | "product" | "transition-state") =>
    terms.filter((t) => t.side === s).flatMap((t) => {
      const comp = t.species ? speciesComposition(t.species) : null;
      if (!comp || "error" in comp) {
        if (t.species) unknown.push(comp && "error" in comp ? `${t.species.label} (${comp.error})` : t.species.label);
        return [];
      }
      return [{ coefficient: t.coefficient, counts: comp.counts, charge: comp.charge, label: t.species!.label }];
    });
  const reactants = side("reactant"), products = side("product"), ts = side("transition-state");
  if (unknown.length) {
    out.push({ code: "balance_unchecked", severity: "warning", message: `The balance of ${what} cannot be checked: no formula or SMILES for ${[...new Set(unknown)].join(", ")}` });
    return out;
  }
  const b = checkBalance({ reactants, products });
  if (!b.balanced) out.push({ code: "unbalanced", severity: "error", message: `${what}: ${b.message}` });
  if (ts.length) {
    const tb = checkBalance({ reactants, products: ts });
    if (!tb.balanced) out.push({ code: "ts_composition", severity: "error", species: ts[0]!.label, message: `Transition state ${ts[0]!.label} does not have the composition of the reactants: ${tb.message}` });
  }
  return out;
}

function tsProblems(ts: TermEval | undefined, levelLabel: string): Problem[] {
  if (!ts?.species) return [];
  const out: Problem[] = [];
  const sp = ts.species;
  if (sp.kind !== "transition-state") out.push({ code: "ts_kind", severity: "warning", species: sp.label, message: `${sp.label} is used as a transition state but its kind is "${sp.kind}"` });
  const imag = ts.eval?.imaginary;
  if (imag) {
    for (const m of ts.eval!.members) {
      if (m.imaginaryFrequencies && m.imaginaryFrequencies.length !== 1) {
        out.push({
          code: "ts_imaginary_modes", severity: "error", species: sp.label, level: levelLabel,
          message: `Transition state ${sp.label}${m.conformer ? ` (conformer ${m.conformer})` : ""} has ${m.imaginaryFrequencies.length} imaginary modes at ${levelLabel}${m.imaginaryFrequencies.length ? ` (${m.imaginaryFrequencies.join(", ")} cm⁻¹)` : ""}; a transition state needs exactly one — barriers and k are not computed`,
        });
      }
    }
  }
  return out;
}

function minimumImaginary(terms: TermEval[], levelLabel: string): Problem[] {
  return terms
    .filter((t) => t.side !== "transition-state" && t.species?.kind === "minimum" && t.eval?.imaginary?.length)
    .map((t) => ({
      code: "minimum_imaginary", severity: "warning" as const, species: t.species!.label, level: levelLabel,
      message: `${t.species!.label} is a minimum but has ${t.eval!.imaginary!.length} imaginary mode(s) at ${levelLabel} (${t.eval!.imaginary!.join(", ")} cm⁻¹); the imaginary modes are left out of its thermal corrections`,
    }));
}

function deltaFor(terms: TermEval[], kind: Kind, barrier: boolean): Delta | null {
  const map = (s: "reactant" | "product") => terms.filter((t) => t.side === s).map((t) => ({ coefficient: t.coefficient, value: t.eval?.energies[kind] ?? null }));
  if (barrier) {
    const ts = terms.find((t) => t.side === "transition-state");
    if (!ts) return null;
    return barrierDelta(map("reactant"), ts.eval?.energies[kind] ?? null);
  }
  return reactionDelta(map("reactant"), map("product"));
}

export type ComputedReaction = {
  id: number;
  equation: string;
  transitionState: string | null;
  protocolId: number | null;
  version: number;
  status: ReactionStatus;
  problems: Problem[];
  values: Values;
  /** Exact hartree differences behind the values, as decimal strings. */
  hartree: Partial<Record<ValueKey, string>>;
  /** Why each null value is null. */
  reasons: Partial<Record<ValueKey, string>>;
  rateConstantUnit: string;
  temperatureK: number | null;
};

function computeOne(r: ReactionRow, terms: TermRow[], ctx: EvalContext | null, unit: EnergyUnit, data: LedgerData): { row: ComputedReaction; terms: TermEval[] } {
  const ts = r.transitionStateId ? (data.species.get(r.transitionStateId) ?? null) : null;
  const termEvals: TermEval[] = terms.map((t) => ({
    side: t.side, coefficient: Number(t.coefficient), species: data.species.get(t.speciesId) ?? null,
    eval: ctx ? evaluateSpecies(ctx, t.speciesId) : null,
  }));
  if (r.transitionStateId) termEvals.push({ side: "transition-state", coefficient: 1, species: ts, eval: ctx && ts ? evaluateSpecies(ctx, ts.id) : null });
  const nReactants = termEvals.filter((t) => t.side === "reactant").reduce((a, t) => a + t.coefficient, 0);
  const row: ComputedReaction = {
    id: r.id, equation: r.equation, transitionState: ts?.label ?? null, protocolId: ctx?.protocol.id ?? null, version: r.version,
    status: "ok", problems: [], values: { deltaE: null, deltaEZPE: null, deltaH: null, deltaG: null, barrierE: null, barrierG: null, rateConstant: null, equilibriumConstant: null },
    hartree: {}, reasons: {},
    rateConstantUnit: nReactants > 1 ? `(mol/L)^${1 - nReactants} s^-1 (molecularity ${nReactants}, 1 mol/L standard state)` : "s^-1",
    temperatureK: ctx ? Number(ctx.protocol.temperatureK) : null,
  };
  const problems: Problem[] = [];
  if (!ctx) {
    problems.push({ code: "no_protocol", severity: "error", message: "The project has no protocol yet: create one (energy level, thermal level, temperature) to compute values" });
  }
  const ltLabel = ctx ? (data.levels.get(ctx.protocol.thermalLevelId ?? ctx.protocol.energyLevelId)?.label ?? "") : "";
  const bal = balanceProblems(termEvals, `${r.equation}`);
  problems.push(...bal);
  const tsProb = tsProblems(termEvals.find((t) => t.side === "transition-state"), ltLabel);
  problems.push(...tsProb);
  problems.push(...minimumImaginary(termEvals, ltLabel));
  for (const t of termEvals) {
    if (!t.eval) continue;
    problems.push(...t.eval.problems);
    for (const k of KINDS) problems.push(...t.eval.missing[k]);
  }
  row.problems = dedupe(problems);
  row.status = statusOf(row.problems);
  if (!ctx) return { row, terms: termEvals };

  const unbalanced = bal.some((p) => p.code === "unbalanced");
  const tsBlocked = tsProb.some((p) => p.severity === "error");
  const T = Number(ctx.protocol.temperatureK);
  const reasonFor = (kind: Kind, barrier: boolean): string => {
    const list = termEvals.filter((t) => (barrier ? t.side !== "product" : t.side !== "transition-state")).flatMap((t) => t.eval?.missing[kind] ?? []);
    return dedupe(list).map((p) => p.message).join("; ");
  };
  const set = (key: ValueKey, kind: Kind, barrier: boolean) => {
    if (unbalanced) return void (row.reasons[key] = "The equation does not balance; no value is computed for it");
    if (barrier && !r.transitionStateId) return void (row.reasons[key] = "No transition state given for this reaction");
    if (barrier && tsBlocked) return void (row.reasons[key] = "The transition state does not have exactly one imaginary mode");
    const d = deltaFor(termEvals, kind, barrier);
    if (!d) return void (row.reasons[key] = reasonFor(kind, barrier) || "A value is missing");
    row.hartree[key] = d.hartree;
    row.values[key] = energyIn(d.quantity, unit);
    return d;
  };
  set("deltaE", "E", false);
  set("deltaEZPE", "EZPE", false);
  set("deltaH", "H", false);
  const dG = set("deltaG", "G", false);
  set("barrierE", "E", true);
  const bG = set("barrierG", "G", true);
  if (dG) row.values.equilibriumConstant = equilibriumConstant(dG.quantity, T);
  else row.reasons.equilibriumConstant = `K needs ΔG: ${row.reasons.deltaG}`;
  if (bG) row.values.rateConstant = eyringRate(bG.quantity, T);
  else row.reasons.rateConstant = `k needs ΔG‡: ${row.reasons.barrierG}`;
  return { row, terms: termEvals };
}

async function contextsFor(data: LedgerData, requested: ProtocolRow | null, reactions: ReactionRow[], termsBy: Map<number, TermRow[]>, explicit: boolean) {
  const byProtocol = new Map<number, Set<number>>();
  const protocolOf = (r: ReactionRow) => (explicit ? requested : (data.protocols.find((p) => p.id === r.protocolId) ?? requested));
  for (const r of reactions) {
    const p = protocolOf(r);
    if (!p) continue;
    let set = byProtocol.get(p.id);
    if (!set) byProtocol.set(p.id, (set = new Set()));
    for (const t of termsBy.get(r.id) ?? []) set.add(t.speciesId);
    if (r.transitionStateId) set.add(r.transitionStateId);
  }
  const contexts = new Map<number, EvalContext>();
  for (const [pid, ids] of byProtocol) contexts.set(pid, await evaluateAll(data, data.protocols.find((p) => p.id === pid)!, ids));
  return { contexts, protocolOf };
}

export type ComputeOptions = { protocol?: string | number | null; unit?: string | null };

/**
 * Every reaction of the project, computed (PRODUCT.md §6 answer). With `protocol`, every row under that
 * protocol; without, each row under its own protocol, else the project's default.
 */
export async function computeReactions(projectId: number, options: ComputeOptions = {}) {
  const unit = parseUnit(options.unit);
  const [data, { reactions, termsBy }] = await Promise.all([loadLedgerData(projectId), loadReactionRows(projectId)]);
  const explicit = options.protocol !== undefined && options.protocol !== null && options.protocol !== "";
  const requested = pickProtocol(data, options.protocol);
  const { contexts, protocolOf } = await contextsFor(data, requested, reactions, termsBy, explicit);
  const rows = reactions.map((r) => {
    const p = protocolOf(r);
    return computeOne(r, termsBy.get(r.id) ?? [], p ? contexts.get(p.id)! : null, unit, data).row;
  });
  return {
    unit,
    protocol: requested ? describeProtocolRow(data, requested) : null,
    protocols: data.protocols.map((p) => describeProtocolRow(data, p)),
    reactions: rows,
  };
}

/** One reaction in full: every term, the calculations used, each contribution and why a value is missing. */
export async function reactionBreakdown(projectId: number, reactionId: number, options: ComputeOptions = {}) {
  const unit = parseUnit(options.unit);
  const [data, { reactions, termsBy }] = await Promise.all([loadLedgerData(projectId), loadReactionRows(projectId, reactionId)]);
  const r = reactions[0];
  if (!r) throw new ServiceError(404, "not_found", "No such reaction in this project");
  const explicit = options.protocol !== undefined && options.protocol !== null && options.protocol !== "";
  const requested = pickProtocol(data, options.protocol);
  const { contexts, protocolOf } = await contextsFor(data, requested, reactions, termsBy, explicit);
  const p = protocolOf(r);
  const ctx = p ? contexts.get(p.id)! : null;
  const { row, terms } = computeOne(r, termsBy.get(r.id) ?? [], ctx, unit, data);
  const le = p ? data.levels.get(p.energyLevelId) : undefined;
  const lt = p ? data.levels.get(p.thermalLevelId ?? p.energyLevelId) : undefined;
  const inUnit = (d: HartreeDecimal | null) => (d === null ? null : energyIn(energy(d.toNumber(), "hartree"), unit));
  const corr = (v: number | null) => (v === null ? null : energyIn(energy(v, "hartree"), unit));
  return {
    unit,
    protocol: p ? describeProtocolRow(data, p) : null,
    reaction: row,
    energyLevel: le ? { id: le.id, key: le.key, label: le.label } : null,
    thermalLevel: lt ? { id: lt.id, key: lt.key, label: lt.label } : null,
    terms: terms.map((t) => {
      const sign = t.side === "reactant" ? -1 : 1;
      const e = t.eval;
      const absolute = Object.fromEntries(KINDS.map((k) => [k, e?.energies[k]?.toString() ?? null])) as Record<Kind, string | null>;
      // Contribution of the term to ΔX (products +ν·X, reactants −ν·X; the TS enters only the barriers), in hartree.
      const contribution = Object.fromEntries(
        KINDS.map((k) => [k, e?.energies[k] ? sumHartree([{ coefficient: sign * t.coefficient, energyHartree: e.energies[k]! }]).toString() : null]),
      ) as Record<Kind, string | null>;
      return {
        side: t.side,
        coefficient: t.coefficient,
        species: t.species ? { id: t.species.id, label: t.species.label, kind: t.species.kind, charge: t.species.charge, multiplicity: t.species.multiplicity, formula: t.species.formula, smiles: t.species.smiles } : null,
        treatment: e?.treatment ?? null,
        absoluteHartree: absolute,
        contributionHartree: contribution,
        members: (e?.members ?? []).map((m) => ({
          conformer: m.conformer,
          population: m.population ?? null,
          energyCalculationId: m.energyCalculationId,
          thermalCalculationId: m.thermalCalculationId,
          thermalSource: m.thermalSource,
          electronicEnergyHartree: m.electronicEnergy,
          zpeHartree: m.zpe,
          enthalpyCorrectionHartree: m.enthalpyCorrection,
          gibbsCorrectionHartree: m.gibbsCorrection,
          standardStateCorrectionHartree: m.standardStateCorrection,
          inUnit: { zpe: corr(m.zpe), enthalpyCorrection: corr(m.enthalpyCorrection), gibbsCorrection: corr(m.gibbsCorrection), standardStateCorrection: corr(m.standardStateCorrection) },
          lowFrequency: m.lowFrequency ?? null,
          imaginaryFrequencies: m.imaginaryFrequencies,
        })),
        missing: e ? Object.fromEntries(KINDS.map((k) => [k, e.missing[k].map((p) => p.message)])) : null,
        contributionInUnit: Object.fromEntries(KINDS.map((k) => [k, contribution[k] === null ? null : inUnit(sumHartree([{ coefficient: 1, energyHartree: contribution[k]! }]))])),
      };
    }),
  };
}

// ---------------------------------------------------------------- pathways
export type PathwayRows = {
  pathway: { id: number; name: string; cycle: boolean; protocolId: number | null; referenceState: number; version: number };
  states: Array<{ id: number; position: number; label: string; terms: Array<{ speciesId: number; coefficient: string }> }>;
};

export async function loadPathwayRows(projectId: number, pathwayId?: number): Promise<PathwayRows[]> {
  const { sequelize } = db();
  const filter = pathwayId ? " AND p.id = :pathwayId" : "";
  const opts = { type: QueryTypes.SELECT, replacements: { projectId, pathwayId } } as const;
  const [pathways, states, terms] = await Promise.all([
    sequelize.query<PathwayRows["pathway"]>(
      `SELECT p.id, p.name, p.cycle, p.protocol_id AS protocolId, p.reference_state AS referenceState, p.version FROM pathways p WHERE p.project_id = :projectId${filter} ORDER BY p.id`,
      opts,
    ),
    sequelize.query<{ id: number; pathwayId: number; position: number; label: string }>(
      `SELECT s.id, s.pathway_id AS pathwayId, s.position, s.label FROM pathway_states s JOIN pathways p ON p.id = s.pathway_id WHERE p.project_id = :projectId${filter} ORDER BY s.pathway_id, s.position`,
      opts,
    ),
    sequelize.query<{ stateId: number; speciesId: number; coefficient: string }>(
      `SELECT t.state_id AS stateId, t.species_id AS speciesId, t.coefficient FROM pathway_state_terms t JOIN pathway_states s ON s.id = t.state_id JOIN pathways p ON p.id = s.pathway_id WHERE p.project_id = :projectId${filter} ORDER BY t.state_id, t.position`,
      opts,
    ),
  ]);
  const termsBy = new Map<number, Array<{ speciesId: number; coefficient: string }>>();
  for (const t of terms) {
    const l = termsBy.get(t.stateId);
    if (l) l.push(t);
    else termsBy.set(t.stateId, [t]);
  }
  return pathways.map((p) => ({
    pathway: { ...p, cycle: Boolean(p.cycle) },
    states: states.filter((s) => s.pathwayId === p.id).map((s) => ({ id: s.id, position: s.position, label: s.label, terms: termsBy.get(s.id) ?? [] })),
  }));
}

export type PathwayState = {
  label: string;
  kind: "minimum" | "transition-state";
  species: Array<{ label: string; coefficient: number }>;
  relativeE: number | null;
  relativeEZPE: number | null;
  relativeH: number | null;
  relativeG: number | null;
  /** For a transition state: barrier against the lowest preceding minimum (G, else E), in the unit. */
  barrier: { value: number; from: string; basis: "G" | "E" } | null;
};

function computePathwayWith(rows: PathwayRows, data: LedgerData, ctx: EvalContext | null, unit: EnergyUnit) {
  const problems: Problem[] = [];
  const { pathway, states } = rows;
  const stateTerms = states.map((s) =>
    s.terms.map((t) => ({ coefficient: Number(t.coefficient), species: data.species.get(t.speciesId) ?? null, eval: ctx ? evaluateSpecies(ctx, t.speciesId) : null })),
  );
  if (!ctx) problems.push({ code: "no_protocol", severity: "error", message: "The project has no protocol yet" });
  const ref = Math.min(Math.max(pathway.referenceState ?? 0, 0), Math.max(states.length - 1, 0));
  const ltLabel = ctx ? (data.levels.get(ctx.protocol.thermalLevelId ?? ctx.protocol.energyLevelId)?.label ?? "") : "";
  const out: PathwayState[] = states.map((s, i) => {
    const terms = stateTerms[i]!;
    const kind = terms.some((t) => t.species?.kind === "transition-state") ? "transition-state" : "minimum";
    if (i !== ref) {
      const bal = balanceProblems(
        [...stateTerms[ref]!.map((t) => ({ ...t, side: "reactant" as const })), ...terms.map((t) => ({ ...t, side: "product" as const }))],
        `state ${s.label} against ${states[ref]!.label}`,
      );
      problems.push(...bal);
    }
    for (const t of terms) {
      if (!t.eval) continue;
      problems.push(...t.eval.problems);
      for (const k of KINDS) problems.push(...t.eval.missing[k]);
      if (t.species?.kind === "transition-state") problems.push(...tsProblems({ side: "transition-state", coefficient: 1, species: t.species, eval: t.eval }, ltLabel));
    }
    const rel = (k: Kind) => {
      if (!ctx) return null;
      const d = reactionDelta(
        stateTerms[ref]!.map((t) => ({ coefficient: t.coefficient, value: t.eval?.energies[k] ?? null })),
        terms.map((t) => ({ coefficient: t.coefficient, value: t.eval?.energies[k] ?? null })),
      );
      return d ? energyIn(d.quantity, unit) : null;
    };
    return {
      label: s.label, kind, species: terms.map((t) => ({ label: t.species?.label ?? "?", coefficient: t.coefficient })),
      relativeE: rel("E"), relativeEZPE: rel("EZPE"), relativeH: rel("H"), relativeG: rel("G"), barrier: null,
    };
  });
  const unique = dedupe(problems);
  const blocked = unique.some((p) => p.code === "unbalanced");
  if (blocked) for (const s of out) s.relativeE = s.relativeEZPE = s.relativeH = s.relativeG = null;

  // Barriers against the lowest preceding minimum (on G when every state has it, else on E).
  const basis: "G" | "E" | null = out.length && out.every((s) => s.relativeG !== null) ? "G" : out.length && out.every((s) => s.relativeE !== null) ? "E" : null;
  if (basis && out[0]?.kind === "minimum") {
    try {
      const bars = profileBarriers(out.map((s) => ({ label: s.label, kind: s.kind, value: (basis === "G" ? s.relativeG : s.relativeE)! })));
      let j = 0;
      for (const s of out) if (s.kind === "transition-state") { const b = bars[j++]!; s.barrier = { value: b.barrier, from: b.from, basis }; }
    } catch (e) {
      unique.push({ code: "profile", severity: "warning", message: (e as Error).message });
    }
  }

  let energeticSpanOut: { deltaE: number; tdts: string; tdi: string; tof: number; tofFromSpan: number; reactionEnergy: number; basis: string } | null = null;
  let degreeOfTofControl: Record<string, number> | null = null;
  if (pathway.cycle && ctx) {
    if (out.some((s) => s.relativeG === null)) {
      unique.push({ code: "span_incomplete", severity: "warning", message: "The energetic span needs G for every state; see the problems above" });
    } else {
      try {
        const span = energeticSpan({
          states: out.map((s) => ({ label: s.label, kind: s.kind, G: energy(s.relativeG!, unit) })),
          temperatureK: Number(ctx.protocol.temperatureK),
        });
        energeticSpanOut = {
          deltaE: convertEnergy(energy(span.deltaE, "kcal/mol"), unit).value,
          tdts: span.tdts, tdi: span.tdi, tof: span.tof, tofFromSpan: span.tofFromSpan,
          reactionEnergy: convertEnergy(energy(span.reactionEnergy, "kcal/mol"), unit).value,
          basis: "Energetic span model (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101) on the computed free energies of this protocol; the TOF is only as good as the computed barriers.",
        };
        degreeOfTofControl = span.degreeOfTofControl;
      } catch (e) {
        unique.push({ code: "span_failed", severity: "warning", message: `Energetic span: ${(e as Error).message}` });
      }
    }
  }
  return {
    unit,
    protocol: ctx ? describeProtocolRow(data, ctx.protocol) : null,
    pathway: { id: pathway.id, name: pathway.name, cycle: pathway.cycle, version: pathway.version, referenceState: ref, protocolId: pathway.protocolId },
    states: out,
    energeticSpan: energeticSpanOut,
    degreeOfTofControl,
    problems: unique,
    status: statusOf(unique),
  };
}

/** One pathway computed (PRODUCT.md §6 answer): relative values against the reference (first) state. */
export async function computePathway(projectId: number, pathwayId: number, options: ComputeOptions = {}) {
  const unit = parseUnit(options.unit);
  const [data, rows] = await Promise.all([loadLedgerData(projectId), loadPathwayRows(projectId, pathwayId)]);
  const row = rows[0];
  if (!row) throw new ServiceError(404, "not_found", "No such pathway in this project");
  const explicit = options.protocol !== undefined && options.protocol !== null && options.protocol !== "";
  const p = explicit ? pickProtocol(data, options.protocol) : (data.protocols.find((x) => x.id === row.pathway.protocolId) ?? defaultProtocolOf(data));
  const ids = row.states.flatMap((s) => s.terms.map((t) => t.speciesId));
  const ctx = p ? await evaluateAll(data, p, ids) : null;
  return computePathwayWith(row, data, ctx, unit);
}

/** Every pathway of the project computed under its own protocol (for listings, snapshots and the workbook). */
export async function computePathways(projectId: number, options: ComputeOptions = {}) {
  const unit = parseUnit(options.unit);
  const [data, rows] = await Promise.all([loadLedgerData(projectId), loadPathwayRows(projectId)]);
  const explicit = options.protocol !== undefined && options.protocol !== null && options.protocol !== "";
  const out = [];
  for (const row of rows) {
    const p = explicit ? pickProtocol(data, options.protocol) : (data.protocols.find((x) => x.id === row.pathway.protocolId) ?? defaultProtocolOf(data));
    const ctx = p ? await evaluateAll(data, p, row.states.flatMap((s) => s.terms.map((t) => t.speciesId))) : null;
    out.push(computePathwayWith(row, data, ctx, unit));
  }
  return { unit, pathways: out };
}

/** Per-species evaluation under a protocol, for the audit: all species of the project. */
export async function evaluateProjectSpecies(data: LedgerData, protocol: ProtocolRow) {
  return evaluateAll(data, protocol, data.species.keys());
}

/**
 * The whole ledger in one pass (the audit, snapshots): the raw data, every reaction and pathway under
 * its own protocol (else the default), and every species evaluated under each protocol in use.
 */
export async function computeProjectLedger(projectId: number, options: { unit?: string } = {}) {
  const unit = parseUnit(options.unit);
  const [data, { reactions, termsBy }, pathwayRows] = await Promise.all([loadLedgerData(projectId), loadReactionRows(projectId), loadPathwayRows(projectId)]);
  const def = defaultProtocolOf(data);
  const protocolsInUse = new Map<number, ProtocolRow>();
  if (def) protocolsInUse.set(def.id, def);
  const own = (id: number | null) => data.protocols.find((p) => p.id === id) ?? def;
  for (const r of reactions) { const p = own(r.protocolId); if (p) protocolsInUse.set(p.id, p); }
  for (const w of pathwayRows) { const p = own(w.pathway.protocolId); if (p) protocolsInUse.set(p.id, p); }
  const contexts = new Map<number, EvalContext>();
  for (const p of protocolsInUse.values()) contexts.set(p.id, await evaluateAll(data, p, data.species.keys()));
  const reactionResults = reactions.map((r) => {
    const p = own(r.protocolId);
    return computeOne(r, termsBy.get(r.id) ?? [], p ? contexts.get(p.id)! : null, unit, data).row;
  });
  const pathwayResults = pathwayRows.map((w) => {
    const p = own(w.pathway.protocolId);
    return computePathwayWith(w, data, p ? contexts.get(p.id)! : null, unit);
  });
  return {
    data,
    unit,
    defaultProtocol: def,
    protocolsInUse: [...protocolsInUse.values()],
    speciesEvaluations: new Map([...contexts].map(([id, ctx]) => [id, ctx.memo])),
    reactions: reactionResults,
    reactionRows: reactions,
    pathways: pathwayResults,
  };
}
