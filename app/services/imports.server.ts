import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { ZodError } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Calculation, Conformer, Level, Species } from "../../db/models/ledger";
import {
  classifyMethod, electronicEnergyPlausibility, formatLevel, hillFormula, HDecimal, ThermoInputError, type ElementCounts,
} from "../domain/thermo";
import {
  parseImportFile, templateCsv, templateXlsx, type ImportField, type ImportProblem, type ImportRow, type ParsedImport,
} from "../domain/import";
import { ServiceError } from "../utils/http.server";
import type { UploadedFile } from "../utils/upload.server";
import { calculationInputSchema, checkElectronicEnergy } from "./calculations.server";
import { parseJsonColumn, recordChanges, type ChangeRecord, type Principal } from "./history.server";
import { levelName, parseLevelInput } from "./levels.server";
import { checkGeometry, conformerInputSchema, countDifferences, countsOf, resolveComposition, speciesInputSchema } from "./species.server";

/**
 * Imports: a file (the project's CSV/XLSX template, QCSchema results, XYZ geometries) checked as a
 * whole against the project, then stored all or nothing in one transaction with its history, or only
 * previewed (dry run). Rows obey the same rules as typed input: the species, level and calculation
 * schemas and checks of their services are called here, not copied.
 */
export type ImportAction = "create" | "update" | "unchanged" | "conflict";

export type ImportItem = {
  row: number;
  action: ImportAction;
  species: string;
  level: string | null;
  conformer: string | null;
  electronicEnergy: string | null;
  note: string;
};

export type ImportReport = {
  dryRun: boolean;
  committed: boolean;
  file: { name: string; format: string; rows: number };
  summary: {
    species: { created: number; updated: number; unchanged: number };
    levels: { created: number; reused: number };
    conformers: { created: number; updated: number; unchanged: number };
    calculations: { created: number; updated: number; unchanged: number };
  };
  species: { label: string; action: ImportAction; formula: string | null }[];
  levels: { key: string; name: string; action: "create" | "reuse"; aliasOf?: string; rows: number[] }[];
  items: ImportItem[];
  itemsTruncated: boolean;
  problems: ImportProblem[];
};

const MAX_ITEMS = 5000;
const CHUNK = 1000;

/** Problems from a service-side check (ServiceError / ZodError / engine error) at `row`, `column`. */
function problemsFrom(error: unknown, row: number, column: string): ImportProblem[] {
  if (error instanceof ServiceError) {
    return error.details.length ? error.details.map((d) => ({ row, column, message: d.message })) : [{ row, column, message: error.message }];
  }
  if (error instanceof ZodError) return error.issues.map((i) => ({ row, column, message: i.message }));
  if (error instanceof ThermoInputError) return [{ row, column, message: error.message.replace(/\.$/, "") }];
  throw error;
}

type SpeciesPlan = {
  label: string;
  row: number;
  existing: Species | null;
  create: { formula: string | null; smiles: string | null; charge: number; multiplicity: number; kind: "minimum" | "transition-state"; geometryXyz: string | null } | null;
  geometryUpdate: string | null;
  counts: ElementCounts | null;
  given: ImportRow["species"];
};

type CalcPlan = {
  row: number;
  speciesLabel: string;
  levelKey: string;
  conformerLabel: string | null;
  existing: Calculation | null;
  values: {
    electronicEnergyText: string | null;
    electronicEnergy: string | null;
    frequencies: number[] | null;
    thermalTemperatureK: string | null;
    zpeHartree: string | null;
    enthalpyCorrectionHartree: string | null;
    gibbsCorrectionHartree: string | null;
    converged: boolean;
    sourceNote: string;
  };
  changes: Record<string, unknown>;
  action: ImportAction;
  note: string;
};

const sameDecimal = (a: string | null | undefined, b: string | null | undefined) => {
  if (a === null || a === undefined || b === null || b === undefined) return a == b;
  try {
    return new HDecimal(a).equals(new HDecimal(b));
  } catch {
    return a === b;
  }
};
const sameList = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/** What the project holds, loaded once per import (bounded by the project, not the file). */
async function loadState(projectId: number, tx?: Transaction) {
  const { models } = db();
  const [species, levels] = await Promise.all([
    models.Species.findAll({ where: { projectId }, transaction: tx }),
    models.Level.findAll({ where: { projectId }, transaction: tx }),
  ]);
  const [conformers, calcs] = await Promise.all([
    species.length ? models.Conformer.findAll({ where: { speciesId: { [Op.in]: species.map((s) => s.id) } }, transaction: tx }) : Promise.resolve([] as Conformer[]),
    models.Calculation.findAll({ where: { projectId }, order: [["id", "ASC"]], transaction: tx }),
  ]);
  const calcByKey = new Map<string, Calculation>();
  // Several calculations for one species, level and conformer: the import compares with the latest.
  for (const c of calcs) calcByKey.set(`${c.speciesId}|${c.levelId}|${c.conformerId ?? 0}`, c);
  return {
    species: new Map(species.map((s) => [s.label, s])),
    levels: new Map(levels.map((l) => [l.key, l])),
    conformers: new Map(conformers.map((c) => [`${c.speciesId}|${c.label}`, c])),
    calcByKey,
  };
}

/** Composition of a new species as its service reads it (the species schema's fields, the engine's rules). */
type Plan = {
  parsed: ParsedImport;
  problems: ImportProblem[];
  species: Map<string, SpeciesPlan>;
  levels: Map<string, { key: string; existing: Level | null; parts: ReturnType<typeof parseLevelInput>; rows: number[]; written: string }>;
  conformers: Map<string, { speciesLabel: string; label: string; row: number; existing: Conformer | null; geometryXyz: string | null; update: string | null }>;
  calcs: CalcPlan[];
};

async function plan(projectId: number, parsed: ParsedImport, tx?: Transaction): Promise<Plan> {
  const state = await loadState(projectId, tx);
  const problems: ImportProblem[] = [...parsed.problems];
  if (!parsed.rows.length && !problems.length) problems.push({ row: 2, column: "", message: "The file holds no rows to import" });
  const col = (f: ImportField, fallback?: string) => parsed.columns[f] ?? fallback ?? f;
  const speciesPlans = new Map<string, SpeciesPlan>();
  const levelPlans: Plan["levels"] = new Map();
  const levelByWritten = new Map<string, string | null>();
  const conformerPlans: Plan["conformers"] = new Map();
  const calcs: CalcPlan[] = [];
  const seenCalc = new Map<string, number>();

  for (const r of parsed.rows) {
    const before = problems.length;
    const bad = (f: ImportField, message: string) => problems.push({ row: r.row, column: col(f), message });

    // ---- species ----
    let sp = speciesPlans.get(r.species.label);
    if (!sp) {
      const label = speciesInputSchema.shape.label.safeParse(r.species.label);
      if (!label.success) {
        for (const i of label.error.issues) bad("species", i.message);
        continue;
      }
      const existing = state.species.get(r.species.label) ?? null;
      sp = { label: r.species.label, row: r.row, existing, create: null, geometryUpdate: null, counts: existing ? countsOf(existing) : null, given: r.species };
      if (!existing) {
        try {
          const comp = resolveComposition(
            { formula: r.species.formula, smiles: r.species.smiles, charge: r.species.charge ?? undefined, multiplicity: r.species.multiplicity ?? undefined },
            r.species.charge !== null && r.species.charge !== undefined,
          );
          const multiplicity = comp.multiplicity;
          speciesInputSchema.parse({ label: r.species.label, charge: comp.charge, multiplicity, kind: r.species.kind ?? undefined });
          sp.counts = comp.counts;
          sp.create = {
            formula: comp.formula,
            smiles: r.species.smiles,
            charge: comp.charge,
            multiplicity,
            kind: r.species.kind ?? "minimum",
            geometryXyz: r.species.geometryXyz ? checkGeometry(r.species.geometryXyz, comp.counts) : null,
          };
        } catch (error) {
          for (const p of problemsFrom(error, r.row, "")) {
            const f: ImportField = /multiplicity/i.test(p.message) ? "multiplicity" : /charge/i.test(p.message) ? "charge" : /SMILES/.test(p.message) && !r.species.formula ? "smiles" : /geometry/i.test(p.message) ? "geometry" : "formula";
            bad(f, p.message);
          }
          continue;
        }
      }
      speciesPlans.set(sp.label, sp);
    }
    // Every row naming the species must agree with the stored (or first-given) values.
    const ref = sp.existing ?? sp.create!;
    const refRow = sp.existing ? "the stored species" : `row ${sp.row}`;
    if (r.species.formula || r.species.smiles) {
      try {
        const comp = resolveComposition({ formula: r.species.formula, smiles: r.species.smiles, charge: r.species.charge ?? ref.charge, multiplicity: ref.multiplicity }, true);
        if (sp.counts) {
          const diff = countDifferences(comp.counts, sp.counts, "this row", refRow);
          if (diff) bad(r.species.formula ? "formula" : "smiles", `Conflicting formula for ${sp.label}: ${diff}`);
        }
      } catch (error) {
        for (const p of problemsFrom(error, r.row, col("formula"))) problems.push(p);
      }
    }
    if (r.species.charge !== null && r.species.charge !== ref.charge) bad("charge", `Conflicting charge for ${sp.label}: ${r.species.charge} here, ${ref.charge} in ${refRow}`);
    if (r.species.multiplicity !== null && r.species.multiplicity !== ref.multiplicity) {
      bad("multiplicity", `Conflicting multiplicity for ${sp.label}: ${r.species.multiplicity} here, ${ref.multiplicity} in ${refRow}`);
    }
    if (r.species.kind !== null && r.species.kind !== ref.kind) bad("kind", `Conflicting kind for ${sp.label}: ${r.species.kind} here, ${ref.kind} in ${refRow}`);
    if (r.species.geometryXyz && !r.conformer) {
      try {
        const g = checkGeometry(r.species.geometryXyz, sp.counts);
        const current = sp.existing ? (sp.existing.geometryXyz ?? null) : sp.create!.geometryXyz;
        const pending = sp.geometryUpdate;
        if (sp.existing && !current && !pending) sp.geometryUpdate = g;
        else if ((pending ?? current) && (pending ?? current) !== g) bad("geometry", `Conflicting geometry for ${sp.label}: it differs from ${refRow}'s`);
      } catch (error) {
        problems.push(...problemsFrom(error, r.row, col("geometry")));
      }
    }

    // ---- conformer ----
    let conformerLabel: string | null = null;
    if (r.conformer) {
      const cl = conformerInputSchema.shape.label.safeParse(r.conformer.label);
      if (!cl.success) {
        for (const i of cl.error.issues) bad("conformer", i.message);
      } else {
        conformerLabel = r.conformer.label;
        const key = `${sp.label}|${conformerLabel}`;
        let cp = conformerPlans.get(key);
        let g: string | null = null;
        try {
          g = r.conformer.geometryXyz ? checkGeometry(r.conformer.geometryXyz, sp.counts) : null;
        } catch (error) {
          problems.push(...problemsFrom(error, r.row, col("geometry")));
        }
        if (!cp) {
          const existing = sp.existing ? (state.conformers.get(`${sp.existing.id}|${conformerLabel}`) ?? null) : null;
          cp = { speciesLabel: sp.label, label: conformerLabel, row: r.row, existing, geometryXyz: existing ? null : g, update: null };
          conformerPlans.set(key, cp);
          if (existing && g) {
            if (!existing.geometryXyz) cp.update = g;
            else if (existing.geometryXyz !== g) bad("conformer", `Conflicting geometry for conformer ${conformerLabel} of ${sp.label}: it differs from the stored one`);
          }
        } else if (g && (cp.geometryXyz ?? cp.update ?? cp.existing?.geometryXyz) && (cp.geometryXyz ?? cp.update ?? cp.existing?.geometryXyz) !== g) {
          bad("conformer", `Conflicting geometry for conformer ${conformerLabel} of ${sp.label}: it differs from row ${cp.row}'s`);
        }
        // A multi-frame file gives the species the first frame when it has none.
        if (g && sp.create && !sp.create.geometryXyz) sp.create.geometryXyz = g;
        if (g && sp.existing && !sp.existing.geometryXyz && !sp.geometryUpdate) sp.geometryUpdate = g;
      }
    }

    // ---- level ----
    let levelKey: string | null = null;
    if (r.level) {
      const written = "text" in r.level ? r.level.text : JSON.stringify(r.level);
      if (levelByWritten.has(written)) levelKey = levelByWritten.get(written)!;
      else {
        try {
          const input = "text" in r.level ? { text: r.level.text } : { method: r.level.method, basis: r.level.basis, dispersion: r.level.dispersion, solvation: r.level.solvation };
          const parts = parseLevelInput(input);
          levelKey = parts.key;
          const lp = levelPlans.get(parts.key);
          if (lp) lp.rows.push(r.row);
          else levelPlans.set(parts.key, { key: parts.key, existing: state.levels.get(parts.key) ?? null, parts, rows: [r.row], written: "text" in r.level ? r.level.text : `${r.level.method}/${r.level.basis}` });
        } catch (error) {
          problems.push(...problemsFrom(error, r.row, col("level", col("method"))));
        }
        levelByWritten.set(written, levelKey);
      }
      if (levelKey && levelPlans.has(levelKey) && !levelPlans.get(levelKey)!.rows.includes(r.row)) levelPlans.get(levelKey)!.rows.push(r.row);
    } else if (r.calculation) bad("level", "Missing level: give the level of theory of this calculation");

    // ---- calculation ----
    if (!r.calculation || problems.length > before || !levelKey) continue;
    const c = r.calculation;
    const values: CalcPlan["values"] = {
      electronicEnergyText: null,
      electronicEnergy: null,
      frequencies: c.frequencies,
      thermalTemperatureK: c.thermal?.temperatureK ?? null,
      zpeHartree: c.thermal?.zpeHartree ?? null,
      enthalpyCorrectionHartree: c.thermal?.enthalpyCorrectionHartree ?? null,
      gibbsCorrectionHartree: c.thermal?.gibbsCorrectionHartree ?? null,
      converged: c.converged,
      sourceNote: c.sourceNote,
    };
    if (c.electronicEnergyHartree !== null) {
      try {
        const e = checkElectronicEnergy(c.electronicEnergyHartree, "electronicEnergy");
        values.electronicEnergyText = e.text;
        values.electronicEnergy = e.decimal;
        if (sp.counts) {
          const level = levelPlans.get(levelKey);
          const semiempirical = level ? classifyMethod(level.parts.parsed.method).kind === "semiempirical" : false;
          const p = electronicEnergyPlausibility(sp.counts, Number(e.text), { semiempirical });
          if (!p.ok) bad("electronicEnergy", `Implausible electronic energy for ${sp.label} (${hillFormula(sp.counts)}): ${p.message}`);
        }
      } catch (error) {
        problems.push(...problemsFrom(error, r.row, col("electronicEnergy")));
      }
    }
    const schema = calculationInputSchema.safeParse({
      species: sp.label,
      level: levelKey,
      frequencies: c.frequencies ?? undefined,
      thermal: c.thermal
        ? { temperature: c.thermal.temperatureK, zpe: c.thermal.zpeHartree ?? "", enthalpyCorrection: c.thermal.enthalpyCorrectionHartree ?? "", gibbsCorrection: c.thermal.gibbsCorrectionHartree ?? "" }
        : undefined,
      source: c.sourceNote,
    });
    if (!schema.success) {
      for (const i of schema.error.issues) {
        const path = i.path.join(".");
        const f: ImportField = path.startsWith("frequencies") ? "frequencies" : path === "thermal.zpe" ? "zpe" : path === "thermal.enthalpyCorrection" ? "enthalpyCorrection" : path === "thermal.gibbsCorrection" ? "gibbsCorrection" : path.startsWith("thermal") ? "thermalTemperature" : "sourceNote";
        bad(f, i.message);
      }
    }
    if (c.thermal && (!c.thermal.zpeHartree || !c.thermal.enthalpyCorrectionHartree || !c.thermal.gibbsCorrectionHartree)) {
      const missing = !c.thermal.zpeHartree ? "zpe" : !c.thermal.enthalpyCorrectionHartree ? "enthalpyCorrection" : "gibbsCorrection";
      bad(missing, "Stored thermal corrections come as a set: give the ZPE, the enthalpy correction and the Gibbs correction");
    }
    if (c.electronicEnergyHartree === null && !c.frequencies?.length && !c.thermal) {
      bad("electronicEnergy", "A calculation needs an electronic energy, frequencies or thermal corrections");
    }
    const key = `${sp.label}|${levelKey}|${conformerLabel ?? ""}`;
    const dup = seenCalc.get(key);
    if (dup !== undefined) {
      bad("species", `Duplicate row: ${sp.label}${conformerLabel ? ` (${conformerLabel})` : ""} at this level is already given in row ${dup}`);
    }
    seenCalc.set(key, r.row);
    if (problems.length > before) continue;

    // Compare with the stored calculation of the same species, level and conformer.
    const level = levelPlans.get(levelKey)!;
    const conformerExisting = conformerLabel ? conformerPlans.get(`${sp.label}|${conformerLabel}`)?.existing : null;
    const existing =
      sp.existing && level.existing && (!conformerLabel || conformerExisting)
        ? (state.calcByKey.get(`${sp.existing.id}|${level.existing.id}|${conformerExisting?.id ?? 0}`) ?? null)
        : null;
    const changes: Record<string, unknown> = {};
    const conflicts: string[] = [];
    if (existing) {
      const compare = (field: keyof CalcPlan["values"], f: ImportField, name: string, same: (a: any, b: any) => boolean) => {
        const mine = values[field];
        if (mine === null || mine === undefined) return;
        const stored = field === "frequencies" ? parseJsonColumn(existing.frequencies) : (existing as any)[field];
        if (stored === null || stored === undefined) changes[field] = mine;
        else if (!same(mine, stored)) {
          conflicts.push(name);
          bad(f, `Conflicting value for the stored calculation #${existing.id}: ${name} ${field === "frequencies" ? "differ" : `is ${String(stored)} there, ${String(mine)} here`}`);
        }
      };
      compare("electronicEnergyText", "electronicEnergy", "the electronic energy", sameDecimal);
      compare("frequencies", "frequencies", "the frequencies", sameList);
      compare("thermalTemperatureK", "thermalTemperature", "the thermal temperature", sameDecimal);
      compare("zpeHartree", "zpe", "the ZPE", sameDecimal);
      compare("enthalpyCorrectionHartree", "enthalpyCorrection", "the enthalpy correction", sameDecimal);
      compare("gibbsCorrectionHartree", "gibbsCorrection", "the Gibbs correction", sameDecimal);
      if (changes.electronicEnergyText) changes.electronicEnergy = values.electronicEnergy;
      if (values.converged !== !!existing.converged) {
        conflicts.push("converged");
        bad("converged", `Conflicting value for the stored calculation #${existing.id}: converged is ${existing.converged ? "yes" : "no"} there, ${values.converged ? "yes" : "no"} here`);
      }
    }
    calcs.push({
      row: r.row,
      speciesLabel: sp.label,
      levelKey,
      conformerLabel,
      existing,
      values,
      changes,
      action: conflicts.length ? "conflict" : !existing ? "create" : Object.keys(changes).length ? "update" : "unchanged",
      note: conflicts.length ? `conflicts with calculation #${existing!.id}: ${conflicts.join(", ")}` : existing ? (Object.keys(changes).length ? `fills ${Object.keys(changes).filter((k) => k !== "electronicEnergy").join(", ")} of #${existing.id}` : `same as calculation #${existing.id}`) : "",
    });
  }
  return { parsed, problems, species: speciesPlans, levels: levelPlans, conformers: conformerPlans, calcs };
}

function report(p: Plan, file: UploadedFile, dryRun: boolean, committed: boolean): ImportReport {
  const speciesList = [...p.species.values()].map((s) => ({
    label: s.label,
    action: (s.create ? "create" : s.geometryUpdate ? "update" : "unchanged") as ImportAction,
    formula: s.create?.formula ?? s.existing?.formula ?? null,
  }));
  const levels = [...p.levels.values()].map((l) => ({
    key: l.key,
    name: l.existing ? levelName(l.existing) : formatLevel(l.parts.parsed),
    action: (l.existing ? "reuse" : "create") as "create" | "reuse",
    ...(l.existing && l.written !== levelName(l.existing) ? { aliasOf: levelName(l.existing) } : {}),
    rows: l.rows.slice(0, 20),
  }));
  const conformers = [...p.conformers.values()];
  const count = <T,>(list: T[], pred: (t: T) => boolean) => list.filter(pred).length;
  const levelOf = (key: string) => levels.find((l) => l.key === key)?.name ?? key;
  const items: ImportItem[] = [];
  const xyzRows = p.parsed.rows.filter((r) => !r.calculation);
  for (const c of p.calcs) {
    if (items.length >= MAX_ITEMS) break;
    items.push({ row: c.row, action: c.action, species: c.speciesLabel, level: levelOf(c.levelKey), conformer: c.conformerLabel, electronicEnergy: c.values.electronicEnergyText, note: c.note });
  }
  for (const r of xyzRows) {
    if (items.length >= MAX_ITEMS) break;
    const s = p.species.get(r.species.label);
    const cp = r.conformer ? p.conformers.get(`${r.species.label}|${r.conformer.label}`) : null;
    const action: ImportAction = cp ? (cp.existing ? (cp.update ? "update" : "unchanged") : "create") : s?.create ? "create" : s?.geometryUpdate ? "update" : "unchanged";
    items.push({ row: r.row, action, species: r.species.label, level: null, conformer: r.conformer?.label ?? null, electronicEnergy: null, note: cp ? "geometry of a conformer" : "geometry of the species" });
  }
  const conflictRows = new Set(p.problems.map((x) => x.row));
  for (const it of items) if (it.action !== "conflict" && conflictRows.has(it.row) && /Conflicting/.test(p.problems.find((x) => x.row === it.row)!.message)) it.action = "conflict";
  return {
    dryRun,
    committed,
    file: { name: file.name, format: p.parsed.format, rows: p.parsed.rows.length },
    summary: {
      species: { created: count(speciesList, (s) => s.action === "create"), updated: count(speciesList, (s) => s.action === "update"), unchanged: count(speciesList, (s) => s.action === "unchanged") },
      levels: { created: count(levels, (l) => l.action === "create"), reused: count(levels, (l) => l.action === "reuse") },
      conformers: { created: count(conformers, (c) => !c.existing), updated: count(conformers, (c) => !!c.existing && !!c.update), unchanged: count(conformers, (c) => !!c.existing && !c.update) },
      calculations: { created: count(p.calcs, (c) => c.action === "create"), updated: count(p.calcs, (c) => c.action === "update"), unchanged: count(p.calcs, (c) => c.action === "unchanged") },
    },
    species: speciesList.slice(0, MAX_ITEMS),
    levels,
    items,
    itemsTruncated: p.calcs.length + xyzRows.length > items.length,
    problems: p.problems,
  };
}

async function parseFile(file: UploadedFile): Promise<ParsedImport> {
  const parsed = await parseImportFile(file.name, file.bytes);
  if (!parsed) {
    throw new ServiceError(422, "unknown_format", `Cannot tell what ${file.name} is: import the CSV or XLSX template, QCSchema JSON (.json) or XYZ (.xyz); attach other files to a calculation as provenance`, [
      { field: "file", message: "Unknown file type" },
    ]);
  }
  return parsed;
}

function refused(r: ImportReport): ServiceError {
  const n = r.problems.length;
  return new ServiceError(
    422,
    "import_refused",
    `${n} problem${n === 1 ? "" : "s"} in ${r.file.name}; nothing was stored`,
    r.problems.map((p) => ({ field: p.column, row: p.row, column: p.column, message: `Row ${p.row}${p.column ? `, ${p.column}` : ""}: ${p.message}` })),
    { report: r },
  );
}

/**
 * Checks a file against the project and, unless `dryRun`, stores it: all or nothing, in one
 * transaction, with one history row per object written and one for the import itself.
 */
export async function importFile(project: Project, by: Principal, file: UploadedFile, options: { dryRun: boolean }): Promise<ImportReport> {
  const parsed = await parseFile(file);
  if (options.dryRun) {
    const p = await plan(project.id, parsed);
    const r = report(p, file, true, false);
    if (r.problems.length) throw refused(r);
    return r;
  }
  const { sequelize } = db();
  try {
    return await sequelize.transaction(async (tx) => {
      // Planned again inside the transaction so that what is written matches what was checked.
      const p = await plan(project.id, parsed, tx);
      const r = report(p, file, false, false);
      if (r.problems.length) throw refused(r);
      await commit(project.id, by, p, file, tx);
      return { ...r, committed: true };
    });
  } catch (error) {
    // Someone else stored the same new species or level between our check and our write.
    if (error instanceof UniqueConstraintError) {
      throw new ServiceError(409, "conflict", "Another change created some of the same species, levels or conformers while this file was being stored; nothing was stored — run the import again");
    }
    throw error;
  }
}

async function commit(projectId: number, by: Principal, p: Plan, file: UploadedFile, tx: Transaction) {
  const { models } = db();
  const history: ChangeRecord[] = [];
  const chunks = <T,>(list: T[]) => Array.from({ length: Math.ceil(list.length / CHUNK) }, (_, i) => list.slice(i * CHUNK, (i + 1) * CHUNK));

  // Levels (few): created one by one so their ids are known.
  const levelIds = new Map<string, number>();
  for (const l of p.levels.values()) {
    if (l.existing) {
      levelIds.set(l.key, l.existing.id);
      continue;
    }
    const parsed = l.parts.parsed;
    const row = await models.Level.create(
      { projectId, key: l.key, method: parsed.method, basis: parsed.basis, dispersion: parsed.dispersion, solvationModel: parsed.solvation?.model ?? null, solvent: parsed.solvation?.solvent ?? null },
      { transaction: tx },
    );
    levelIds.set(l.key, row.id);
    history.push({ projectId, action: "create", objectType: "level", objectId: row.id, summary: `Import ${file.name}: added level ${levelName(row)}`, newValues: { key: l.key } });
  }

  // Species: bulk, then read back by label for their ids.
  const speciesIds = new Map<string, number>();
  const newSpecies = [...p.species.values()].filter((s) => s.create);
  for (const s of p.species.values()) if (s.existing) speciesIds.set(s.label, s.existing.id);
  for (const part of chunks(newSpecies)) {
    await models.Species.bulkCreate(
      part.map((s) => ({ projectId, label: s.label, notes: "", ...s.create! })),
      { transaction: tx },
    );
    const rows = await models.Species.findAll({ where: { projectId, label: { [Op.in]: part.map((s) => s.label) } }, attributes: ["id", "label", "formula"], transaction: tx });
    for (const row of rows) {
      speciesIds.set(row.label, row.id);
      history.push({ projectId, action: "create", objectType: "species", objectId: row.id, summary: `Import ${file.name}: added species ${row.label} (${row.formula})`, newValues: { label: row.label, ...p.species.get(row.label)!.create, geometryXyz: undefined } });
    }
  }
  for (const s of p.species.values()) {
    if (!s.existing || !s.geometryUpdate) continue;
    await s.existing.update({ geometryXyz: s.geometryUpdate, version: s.existing.version + 1 }, { transaction: tx });
    history.push({ projectId, action: "update", objectType: "species", objectId: s.existing.id, summary: `Import ${file.name}: geometry of ${s.label}`, oldValues: { geometryXyz: null }, newValues: { geometryXyz: "(from file)" } });
  }

  // Conformers.
  const conformerIds = new Map<string, number>();
  const newConformers = [...p.conformers.values()].filter((c) => !c.existing);
  for (const c of p.conformers.values()) if (c.existing) conformerIds.set(`${c.speciesLabel}|${c.label}`, c.existing.id);
  for (const part of chunks(newConformers)) {
    await models.Conformer.bulkCreate(part.map((c) => ({ speciesId: speciesIds.get(c.speciesLabel)!, label: c.label, geometryXyz: c.geometryXyz })), { transaction: tx });
    const rows = await models.Conformer.findAll({ where: { speciesId: { [Op.in]: [...new Set(part.map((c) => speciesIds.get(c.speciesLabel)!))] } }, attributes: ["id", "speciesId", "label"], transaction: tx });
    const labelOf = new Map([...speciesIds].map(([l, id]) => [id, l]));
    for (const row of rows) {
      const key = `${labelOf.get(row.speciesId)}|${row.label}`;
      if (conformerIds.has(key)) continue;
      conformerIds.set(key, row.id);
      history.push({ projectId, action: "create", objectType: "conformer", objectId: row.id, summary: `Import ${file.name}: added conformer ${row.label} of ${labelOf.get(row.speciesId)}` });
    }
  }
  for (const c of p.conformers.values()) {
    if (!c.existing || !c.update) continue;
    await c.existing.update({ geometryXyz: c.update, version: c.existing.version + 1 }, { transaction: tx });
    history.push({ projectId, action: "update", objectType: "conformer", objectId: c.existing.id, summary: `Import ${file.name}: geometry of conformer ${c.label} of ${c.speciesLabel}` });
  }

  // Calculations: bulk in chunks; ids come back from the insert (consecutive auto-increment ids).
  const created = p.calcs.filter((c) => c.action === "create");
  for (const part of chunks(created)) {
    const rows = await models.Calculation.bulkCreate(
      part.map((c) => ({
        projectId,
        speciesId: speciesIds.get(c.speciesLabel)!,
        levelId: levelIds.get(c.levelKey)!,
        conformerId: c.conformerLabel ? conformerIds.get(`${c.speciesLabel}|${c.conformerLabel}`)! : null,
        ...c.values,
        createdBy: by.userId,
        updatedBy: by.userId,
      })),
      { transaction: tx },
    );
    rows.forEach((row, i) => {
      const c = part[i]!;
      history.push({
        projectId,
        action: "create",
        objectType: "calculation",
        objectId: row.id ?? null,
        summary: `Import ${file.name} row ${c.row}: calculation of ${c.speciesLabel}${c.conformerLabel ? ` (${c.conformerLabel})` : ""} at ${c.levelKey}`,
        newValues: { electronicEnergyText: c.values.electronicEnergyText, converged: c.values.converged, sourceNote: c.values.sourceNote },
      });
    });
  }
  for (const c of p.calcs) {
    if (c.action !== "update" || !c.existing) continue;
    const old: Record<string, unknown> = {};
    for (const k of Object.keys(c.changes)) old[k] = (c.existing as any)[k] ?? null;
    await c.existing.update({ ...c.changes, updatedBy: by.userId, version: c.existing.version + 1 } as never, { transaction: tx });
    history.push({ projectId, action: "update", objectType: "calculation", objectId: c.existing.id, summary: `Import ${file.name} row ${c.row}: filled values of calculation #${c.existing.id}`, oldValues: old, newValues: c.changes });
  }
  history.push({
    projectId,
    action: "create",
    objectType: "import",
    objectId: null,
    summary: `Imported ${file.name} (${p.parsed.format}, ${p.parsed.rows.length} rows): ${newSpecies.length} species, ${created.length} calculations created, ${p.calcs.filter((c) => c.action === "update").length} updated`,
  });
  for (const part of chunks(history)) await recordChanges(tx, by, part);
}

/** The filled example template, as the import page offers it. */
export async function importTemplate(format: "csv" | "xlsx"): Promise<{ body: Uint8Array; contentType: string; fileName: string }> {
  if (format === "csv") {
    return { body: new TextEncoder().encode(templateCsv()), contentType: "text/csv; charset=utf-8", fileName: "thermotally-import-template.csv" };
  }
  return {
    body: await templateXlsx(),
    contentType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    fileName: "thermotally-import-template.xlsx",
  };
}
