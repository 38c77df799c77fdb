import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Calculation, Conformer, Level, Species } from "../../db/models/ledger";
import { hartreeDifference, toHartreeDecimal, ThermoInputError } from "../domain/thermo";
import { ServiceError, type ErrorDetail } from "../utils/http.server";
import { parseJsonColumn, recordChange, recordChanges, snapshotOf, type ChangeRecord, type Principal } from "./history.server";
import { optionalBool, refSchema, versionSchema } from "./ledger-input.server";
import { levelName } from "./levels.server";
import { invalidField, resolveLevel, resolveSpecies, type Ref } from "./refs.server";
import { imaginaryCount, resolveConformer } from "./species.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

/** Hartree values arrive as decimal strings (kept exactly) or numbers. */
const hartreeValue = z.union([z.string().trim().max(40, "At most 40 characters"), z.number()], { message: "must be a decimal number in hartree" });
const optionalHartree = z.preprocess((v) => (v === "" ? null : v), hartreeValue.nullable().optional());

const thermalSchema = z
  .object({
    temperature: z.coerce.number({ message: "thermal.temperature must be a number in K" }).refine((v) => Number.isFinite(v) && v > 0 && v <= 10000, "thermal.temperature must be above 0 K (and at most 10000 K)"),
    zpe: hartreeValue,
    enthalpyCorrection: hartreeValue,
    gibbsCorrection: hartreeValue,
  })
  .nullable()
  .optional();

const frequenciesSchema = z.preprocess(
  (v) => (typeof v === "string" ? (v.trim() === "" ? null : v.split(/[\s,;]+/).filter(Boolean).map(Number)) : v),
  z
    .array(z.number({ message: "each frequency must be a number in cm⁻¹" }).refine((f) => Number.isFinite(f) && Math.abs(f) < 100000 && f !== 0, "each frequency must be a non-zero number in cm⁻¹ (imaginary modes negative)"), {
      message: "frequencies must be a list of numbers in cm⁻¹",
    })
    .max(3000, "At most 3000 frequencies")
    .nullable()
    .optional(),
);

const calculationFields = {
  species: refSchema("species"),
  conformer: z.preprocess((v) => (v === "" ? null : v), refSchema("conformer").nullable().optional()),
  level: refSchema("level"),
  electronicEnergy: optionalHartree,
  frequencies: frequenciesSchema,
  thermal: thermalSchema,
  converged: optionalBool,
  source: z.string().max(5000, "At most 5000 characters").optional(),
};
export const calculationInputSchema = z.object(calculationFields);
export const calculationUpdateSchema = z.object({
  ...calculationFields,
  species: refSchema("species").optional(),
  level: refSchema("level").optional(),
  version: versionSchema,
});
export type CalculationInput = z.input<typeof calculationInputSchema>;
export type CalculationUpdate = z.input<typeof calculationUpdateSchema>;

/**
 * An electronic energy as entered: a decimal number in hartree, negative (a bound molecule's total
 * electronic energy is always below zero; a positive number is a relative energy or a unit mix-up).
 */
export function checkElectronicEnergy(value: string | number, field = "electronicEnergy"): { text: string; decimal: string } {
  const text = typeof value === "number" ? String(value) : value.trim();
  let d;
  try {
    d = toHartreeDecimal(text, field);
  } catch (error) {
    if (error instanceof ThermoInputError) throw invalidField(field, `${field} must be a decimal number in hartree, e.g. -1234.567890123 (got ${JSON.stringify(String(value))})`);
    throw error;
  }
  if (!d.isNegative() || d.isZero()) {
    throw invalidField(field, `${field} must be negative: total electronic energies in hartree are below zero (got ${text}); a relative energy or a value in kcal/mol does not belong here`);
  }
  if (d.abs().greaterThanOrEqualTo(1e9)) throw invalidField(field, `${field} ${text} is too large to be an energy in hartree`);
  return { text, decimal: d.toFixed(12) };
}

function checkHartree(value: string | number, field: string): string {
  const text = typeof value === "number" ? String(value) : value.trim();
  try {
    const d = toHartreeDecimal(text, field);
    if (d.abs().greaterThan(100)) throw invalidField(field, `${field} ${text} hartree is implausibly large for a thermal correction`);
  } catch (error) {
    if (error instanceof ThermoInputError) throw invalidField(field, `${field} must be a decimal number in hartree (got ${JSON.stringify(String(value))})`);
    throw error;
  }
  return text;
}

function thermalColumns(thermal: z.output<typeof thermalSchema>) {
  if (thermal === undefined) return {};
  if (thermal === null) return { thermalTemperatureK: null, zpeHartree: null, enthalpyCorrectionHartree: null, gibbsCorrectionHartree: null };
  const zpe = checkHartree(thermal.zpe, "thermal.zpe");
  if (Number(zpe) < 0) throw invalidField("thermal.zpe", "thermal.zpe cannot be negative");
  return {
    thermalTemperatureK: String(thermal.temperature),
    zpeHartree: zpe,
    enthalpyCorrectionHartree: checkHartree(thermal.enthalpyCorrection, "thermal.enthalpyCorrection"),
    gibbsCorrectionHartree: checkHartree(thermal.gibbsCorrection, "thermal.gibbsCorrection"),
  };
}

export type CalculationView = ReturnType<typeof describeCalculation>;

export function describeCalculation(
  c: Calculation,
  names: { species?: Pick<Species, "id" | "label"> | null; level?: Level | null; conformer?: Pick<Conformer, "id" | "label"> | null },
) {
  const frequencies = parseJsonColumn(c.frequencies) as number[] | null;
  return {
    id: c.id,
    species: { id: c.speciesId, label: names.species?.label ?? null },
    conformer: c.conformerId ? { id: c.conformerId, label: names.conformer?.label ?? null } : null,
    level: { id: c.levelId, key: names.level?.key ?? null, name: names.level ? levelName(names.level) : null },
    /** hartree, exactly as entered */
    electronicEnergy: c.electronicEnergyText ?? null,
    frequencies: frequencies ?? null,
    imaginaryModes: imaginaryCount(frequencies),
    thermal:
      c.thermalTemperatureK !== null && c.thermalTemperatureK !== undefined
        ? {
            temperature: Number(c.thermalTemperatureK),
            zpe: c.zpeHartree ?? null,
            enthalpyCorrection: c.enthalpyCorrectionHartree ?? null,
            gibbsCorrection: c.gibbsCorrectionHartree ?? null,
          }
        : null,
    converged: !!c.converged,
    source: c.sourceNote ?? "",
    createdBy: c.createdBy ?? null,
    updatedBy: c.updatedBy ?? null,
    version: c.version,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

/** Names of the species, levels and conformers of a project, for describing many calculations at once. */
async function nameMaps(projectId: number, tx?: Transaction) {
  const { Species, Level, Conformer } = db().models;
  const [species, levels] = await Promise.all([
    Species.findAll({ where: { projectId }, attributes: ["id", "label"], transaction: tx }),
    Level.findAll({ where: { projectId }, transaction: tx }),
  ]);
  const conformers = species.length
    ? await Conformer.findAll({ where: { speciesId: { [Op.in]: species.map((s) => s.id) } }, attributes: ["id", "label", "speciesId"], transaction: tx })
    : [];
  return {
    species: new Map(species.map((s) => [s.id, s])),
    levels: new Map(levels.map((l) => [l.id, l])),
    conformers: new Map(conformers.map((c) => [c.id, c])),
  };
}

const describeWith = (maps: Awaited<ReturnType<typeof nameMaps>>) => (c: Calculation) =>
  describeCalculation(c, { species: maps.species.get(c.speciesId), level: maps.levels.get(c.levelId), conformer: c.conformerId ? maps.conformers.get(c.conformerId) : null });

export const calculationFilterSchema = z.object({
  species: z.string().trim().min(1).optional(),
  level: z.string().trim().min(1).optional(),
});

export async function listCalculations(projectId: number, filter: z.infer<typeof calculationFilterSchema> = {}) {
  const where: Record<string, unknown> = { projectId };
  if (filter.species) where.speciesId = (await resolveSpecies(projectId, filter.species)).id;
  if (filter.level) where.levelId = (await resolveLevel(projectId, filter.level)).id;
  const [rows, maps] = await Promise.all([
    db().models.Calculation.findAll({ where, order: [["id", "ASC"]] }),
    nameMaps(projectId),
  ]);
  return rows.map(describeWith(maps));
}

/**
 * The calculations of a filter with the names of who stored and who last changed each one (the users
 * are read in one query); null when not recorded.
 */
export async function listCalculationsWithAuthors(projectId: number, filter: z.infer<typeof calculationFilterSchema> = {}) {
  const calcs = await listCalculations(projectId, filter);
  const ids = [...new Set(calcs.flatMap((c) => [c.createdBy, c.updatedBy]).filter((id): id is number => id !== null))];
  const users = ids.length ? await db().models.User.findAll({ where: { id: { [Op.in]: ids } }, attributes: ["id", "name"] }) : [];
  const names = new Map(users.map((u) => [u.id, u.name]));
  const nameOf = (id: number | null) => (id === null ? null : (names.get(id) ?? null));
  return calcs.map((c) => ({ ...c, createdByName: nameOf(c.createdBy), updatedByName: nameOf(c.updatedBy) }));
}

async function findCalculation(projectId: number, ref: Ref, tx?: Transaction) {
  const id = typeof ref === "number" ? ref : /^\d+$/.test(ref) ? Number(ref) : null;
  const c = id ? await db().models.Calculation.findOne({ where: { projectId, id }, transaction: tx }) : null;
  if (!c) throw new ServiceError(404, "not_found", `No calculation ${String(ref)} in this project`);
  return c;
}

async function describeOne(c: Calculation, tx?: Transaction) {
  const { Species, Level, Conformer } = db().models;
  const [species, level, conformer] = await Promise.all([
    Species.findByPk(c.speciesId, { transaction: tx }),
    Level.findByPk(c.levelId, { transaction: tx }),
    c.conformerId ? Conformer.findByPk(c.conformerId, { transaction: tx }) : null,
  ]);
  return describeCalculation(c, { species, level, conformer });
}

export async function getCalculation(projectId: number, ref: Ref) {
  return describeOne(await findCalculation(projectId, ref));
}

type CalcValues = Omit<z.output<typeof calculationUpdateSchema>, "species" | "level" | "conformer" | "version">;

function valueColumns(data: CalcValues) {
  const cols: Partial<Calculation["_attributes"]> = {};
  if (data.electronicEnergy !== undefined) {
    if (data.electronicEnergy === null) Object.assign(cols, { electronicEnergyText: null, electronicEnergy: null });
    else {
      const e = checkElectronicEnergy(data.electronicEnergy);
      Object.assign(cols, { electronicEnergyText: e.text, electronicEnergy: e.decimal });
    }
  }
  if (data.frequencies !== undefined) cols.frequencies = data.frequencies;
  Object.assign(cols, thermalColumns(data.thermal));
  if (data.converged !== undefined) cols.converged = data.converged;
  if (data.source !== undefined) cols.sourceNote = data.source;
  return cols;
}

function assertHasResult(row: { electronicEnergyText?: string | null; frequencies?: unknown; thermalTemperatureK?: string | null }) {
  if (!row.electronicEnergyText && !row.frequencies && !row.thermalTemperatureK) {
    throw invalidField("electronicEnergy", "A calculation needs an electronic energy, frequencies or thermal corrections");
  }
}

export async function createCalculation(project: Project, by: Principal, input: CalculationInput, tx?: Transaction) {
  const data = calculationInputSchema.parse(input);
  const cols = valueColumns(data);
  assertHasResult(cols);
  const { sequelize, models } = db();
  const run = async (transaction: Transaction) => {
    const species = await resolveSpecies(project.id, data.species, transaction);
    const level = await resolveLevel(project.id, data.level, transaction);
    const conformer = data.conformer ? await resolveConformer(species, data.conformer, transaction) : null;
    const c = await models.Calculation.create(
      { projectId: project.id, speciesId: species.id, levelId: level.id, conformerId: conformer?.id ?? null, sourceNote: "", createdBy: by.userId, updatedBy: by.userId, ...cols },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "calculation",
      objectId: c.id,
      summary: `Added a calculation for ${species.label}${conformer ? ` (${conformer.label})` : ""} at ${levelName(level)}`,
      newValues: snapshotOf(c),
    });
    return describeCalculation(c, { species, level, conformer });
  };
  return tx ? run(tx) : sequelize.transaction(run);
}

export async function updateCalculation(project: Project, by: Principal, ref: Ref, input: CalculationUpdate) {
  const data = calculationUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const c = await findCalculation(project.id, ref, transaction);
    if (version !== undefined && version !== c.version) {
      await updateVersioned(transaction, by, c, version, {}, { projectId: project.id, objectType: "calculation", summary: "" });
    }
    const cols = valueColumns(data);
    const species = data.species !== undefined ? await resolveSpecies(project.id, data.species, transaction) : null;
    if (species) cols.speciesId = species.id;
    if (data.level !== undefined) cols.levelId = (await resolveLevel(project.id, data.level, transaction)).id;
    if (data.conformer !== undefined) {
      const owner = species ?? (await db().models.Species.findByPk(c.speciesId, { transaction }))!;
      cols.conformerId = data.conformer === null ? null : (await resolveConformer(owner, data.conformer, transaction)).id;
    } else if (species && species.id !== c.speciesId) cols.conformerId = null;
    assertHasResult({ electronicEnergyText: c.electronicEnergyText, frequencies: c.frequencies, thermalTemperatureK: c.thermalTemperatureK, ...cols });
    cols.updatedBy = by.userId;
    const updated = await updateVersioned(transaction, by, c, version, cols, { projectId: project.id, objectType: "calculation", summary: `Changed calculation #${c.id}` });
    return describeOne(updated, transaction);
  });
}

/** Deletes a calculation; with `version`, only if it is still the one the caller saw (else 409 with the current values). */
export async function deleteCalculation(project: Project, by: Principal, ref: Ref, version?: number) {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const c = await findCalculation(project.id, ref, transaction);
    await assertVersion(transaction, c, version, "calculation", undefined, "decide again");
    const old = snapshotOf(c);
    await c.destroy({ transaction });
    await recordChange(transaction, by, { projectId: project.id, action: "delete", objectType: "calculation", objectId: c.id, summary: `Deleted calculation #${c.id}`, oldValues: old });
  });
}

// ---------- the calculations grid: species × level ----------

export const gridCellSchema = z.object({
  species: refSchema("species"),
  level: refSchema("level"),
  electronicEnergy: z.union([z.string().max(60), z.number(), z.null()], { message: "must be a decimal number in hartree" }),
  /** The version of the calculation the edit was based on (optional; a stale one refuses the whole block). */
  version: versionSchema,
  /** Where the cell sits in what was pasted (0-based), for the error list. */
  row: z.number().int().min(0).optional(),
  column: z.number().int().min(0).optional(),
});
export const gridInputSchema = z.object({ cells: z.array(gridCellSchema).min(1, "Paste at least one cell").max(20000, "At most 20000 cells at once") });
export type GridCell = z.input<typeof gridCellSchema>;

/**
 * The grid's cell: the calculation of a species at a level without a conformer (the most recently
 * changed one if there are several). A paste writes into it or creates it.
 */
function cellCalculation(calcs: Calculation[]): Calculation | undefined {
  return calcs.filter((c) => !c.conformerId).sort((a, b) => b.updatedAt.getTime() - a.updatedAt.getTime() || b.id - a.id)[0];
}

/**
 * Applies a block of electronic energies (a spreadsheet paste or one edited cell) as a whole: every
 * cell is checked first and every bad one listed with its row and column; nothing is stored unless all
 * are good. An empty cell changes nothing. One transaction, one history row per changed calculation.
 */
export async function applyCalculationGrid(project: Project, by: Principal, cells: GridCell[]) {
  const { cells: parsed } = gridInputSchema.parse({ cells });
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const problems: ErrorDetail[] = [];
    const where = (i: number, c: (typeof parsed)[number]) => ({
      row: c.row ?? i,
      column: c.column ?? 0,
      at: c.row !== undefined ? `row ${c.row + 1}, column ${(c.column ?? 0) + 1}` : `cell ${i + 1}`,
    });
    const plan: { species: Species; level: Level; energy: { text: string; decimal: string } | null; version?: number; i: number }[] = [];
    const speciesCache = new Map<string, Species>();
    const levelCache = new Map<string, Level>();
    for (const [i, cell] of parsed.entries()) {
      const pos = where(i, cell);
      const failed = (field: string, message: string) => problems.push({ field: `cells[${i}].${field}`, row: pos.row, column: pos.column, message: `${pos.at}: ${message}` });
      let species: Species | undefined;
      let level: Level | undefined;
      try {
        const key = String(cell.species);
        species = speciesCache.get(key) ?? (await resolveSpecies(project.id, cell.species, transaction));
        speciesCache.set(key, species);
      } catch (error) {
        if (!(error instanceof ServiceError)) throw error;
        failed("species", error.message);
      }
      try {
        const key = String(cell.level);
        level = levelCache.get(key) ?? (await resolveLevel(project.id, cell.level, transaction));
        levelCache.set(key, level);
      } catch (error) {
        if (!(error instanceof ServiceError)) throw error;
        failed("level", error.message);
      }
      const raw = cell.electronicEnergy === null ? "" : String(cell.electronicEnergy).trim();
      if (raw === "") continue;
      let energy: { text: string; decimal: string } | null = null;
      try {
        energy = checkElectronicEnergy(raw.replace(/\u2212/g, "-"), "electronicEnergy");
      } catch (error) {
        if (!(error instanceof ServiceError)) throw error;
        failed("electronicEnergy", error.message);
      }
      if (species && level && energy) plan.push({ species, level, energy, version: cell.version, i });
    }
    if (problems.length) {
      throw new ServiceError(422, "invalid_grid", `${problems.length} cell(s) cannot be stored; nothing was changed`, problems);
    }
    const seen = new Set<string>();
    for (const p of plan) {
      const k = `${p.species.id}:${p.level.id}`;
      if (seen.has(k)) {
        const pos = where(p.i, parsed[p.i]!);
        problems.push({ field: `cells[${p.i}]`, row: pos.row, column: pos.column, message: `${pos.at}: ${p.species.label} at ${levelName(p.level)} appears twice in this block` });
      }
      seen.add(k);
    }
    if (problems.length) throw new ServiceError(422, "invalid_grid", `${problems.length} cell(s) cannot be stored; nothing was changed`, problems);

    const existing = plan.length
      ? await models.Calculation.findAll({
          where: { projectId: project.id, speciesId: { [Op.in]: [...new Set(plan.map((p) => p.species.id))] }, levelId: { [Op.in]: [...new Set(plan.map((p) => p.level.id))] } },
          transaction,
          lock: transaction.LOCK.UPDATE,
        })
      : [];
    const byCell = new Map<string, Calculation[]>();
    for (const c of existing) {
      const k = `${c.speciesId}:${c.levelId}`;
      byCell.set(k, [...(byCell.get(k) ?? []), c]);
    }
    const changes: ChangeRecord[] = [];
    let created = 0;
    let updated = 0;
    let unchanged = 0;
    for (const p of plan) {
      const current = cellCalculation(byCell.get(`${p.species.id}:${p.level.id}`) ?? []);
      if (p.version !== undefined && current && current.version !== p.version) {
        throw new ServiceError(
          409,
          "stale_version",
          `The energy of ${p.species.label} at ${levelName(p.level)} was changed by someone else (your version ${p.version}, current ${current.version}); reload and apply your edit again`,
          [],
          { current: describeCalculation(current, { species: p.species, level: p.level }) },
        );
      }
      if (current) {
        if (current.electronicEnergyText === p.energy!.text) {
          unchanged++;
          continue;
        }
        const old = { electronicEnergyText: current.electronicEnergyText };
        await current.update({ electronicEnergyText: p.energy!.text, electronicEnergy: p.energy!.decimal, updatedBy: by.userId, version: current.version + 1 }, { transaction });
        changes.push({ projectId: project.id, action: "update", objectType: "calculation", objectId: current.id, summary: `Grid: energy of ${p.species.label} at ${levelName(p.level)}`, oldValues: old, newValues: { electronicEnergyText: p.energy!.text } });
        updated++;
      } else {
        const c = await models.Calculation.create(
          { projectId: project.id, speciesId: p.species.id, levelId: p.level.id, electronicEnergyText: p.energy!.text, electronicEnergy: p.energy!.decimal, sourceNote: "calculations grid", createdBy: by.userId, updatedBy: by.userId },
          { transaction },
        );
        changes.push({ projectId: project.id, action: "create", objectType: "calculation", objectId: c.id, summary: `Grid: energy of ${p.species.label} at ${levelName(p.level)}`, newValues: snapshotOf(c) });
        created++;
      }
    }
    await recordChanges(transaction, by, changes);
    return { created, updated, unchanged };
  });
}

/** The grid's data: one row per species, one column per level, the cell's calculation (see cellCalculation). */
export async function calculationGrid(projectId: number) {
  const { models } = db();
  const [species, levels, calcs, flags] = await Promise.all([
    models.Species.findAll({ where: { projectId }, attributes: ["id", "label", "kind", "formula"], order: [["id", "ASC"]] }),
    models.Level.findAll({ where: { projectId }, order: [["id", "ASC"]] }),
    models.Calculation.findAll({ where: { projectId }, attributes: ["id", "speciesId", "levelId", "conformerId", "electronicEnergyText", "converged", "version", "updatedAt", "frequencies"] }),
    calculationCellFlags(projectId),
  ]);
  const byCell = new Map<string, Calculation[]>();
  for (const c of calcs) {
    const k = `${c.speciesId}:${c.levelId}`;
    byCell.set(k, [...(byCell.get(k) ?? []), c]);
  }
  return {
    levels: levels.map((l) => ({ id: l.id, key: l.key, name: levelName(l) })),
    rows: species.map((s) => ({
      speciesId: s.id,
      label: s.label,
      kind: s.kind,
      formula: s.formula ?? null,
      cells: Object.fromEntries(
        levels.map((l) => {
          const list = byCell.get(`${s.id}:${l.id}`) ?? [];
          const c = cellCalculation(list);
          return [
            String(l.id),
            {
              calculationId: c?.id ?? null,
              energy: c?.electronicEnergyText ?? null,
              version: c?.version ?? null,
              count: list.length,
              hasFrequencies: list.some((x) => Array.isArray(parseJsonColumn(x.frequencies))),
              flags: flags.get(`${s.id}:${l.id}`) ?? [],
            },
          ];
        }),
      ),
    })),
  };
}

// ---------- flags on grid cells ----------

export type CellFlag = { code: string; severity: "error" | "warning"; message: string };
export type CellFlagContext = { projectId: number; species: Map<number, Pick<Species, "id" | "label" | "kind">>; levels: Map<number, Level>; calculations: Calculation[] };
/**
 * Rules that mark grid cells feeding a current error. Each returns flags keyed `${speciesId}:${levelId}`;
 * more rules (the audit's) are added by pushing to this list.
 */
export const cellFlagRules: ((ctx: CellFlagContext) => Map<string, CellFlag[]> | Promise<Map<string, CellFlag[]>>)[] = [];

/** Two stored energies for one species and level that differ by more than this (hartree) disagree (about 0.0006 kcal/mol; common practice for "the same number"). */
export const DUPLICATE_TOLERANCE_HARTREE = "0.000001";

/** True when stored energies of one species and level differ by more than the tolerance (or one is unreadable). */
export function energiesDisagree(list: readonly { electronicEnergyText: string | null }[]): boolean {
  const first = list[0];
  if (!first?.electronicEnergyText) return false;
  return list.some((c) => {
    try {
      return hartreeDifference(c.electronicEnergyText!, first.electronicEnergyText!).abs().greaterThan(DUPLICATE_TOLERANCE_HARTREE);
    } catch {
      return true;
    }
  });
}

const push = (m: Map<string, CellFlag[]>, key: string, flag: CellFlag) => m.set(key, [...(m.get(key) ?? []), flag]);

cellFlagRules.push(({ calculations, species }) => {
  const out = new Map<string, CellFlag[]>();
  const groups = new Map<string, Calculation[]>();
  for (const c of calculations) {
    const key = `${c.speciesId}:${c.levelId}`;
    if (!c.converged) push(out, key, { code: "not-converged", severity: "warning", message: `Calculation #${c.id} is marked not converged` });
    if (c.electronicEnergyText && !c.electronicEnergyText.trim().startsWith("-")) {
      push(out, key, { code: "positive-energy", severity: "error", message: `Calculation #${c.id} has a non-negative electronic energy (${c.electronicEnergyText})` });
    }
    if (c.electronicEnergyText) {
      const g = `${key}:${c.conformerId ?? 0}`;
      groups.set(g, [...(groups.get(g) ?? []), c]);
    }
  }
  for (const [g, list] of groups) {
    if (list.length < 2) continue;
    const [sid, lid] = g.split(":");
    if (energiesDisagree(list)) {
      push(out, `${sid}:${lid}`, {
        code: "duplicates-disagree",
        severity: "error",
        message: `${list.length} calculations of ${species.get(Number(sid))?.label ?? "this species"} at this level disagree (${list.map((c) => c.electronicEnergyText).join(", ")})`,
      });
    }
  }
  return out;
});

// The audit's errors (a missing energy a reaction needs, levels mixed, a TS without exactly one imaginary
// mode …). Imported when first used: the audit module itself builds on this one.
cellFlagRules.push(async ({ projectId }) => (await import("./audit.server")).auditCellFlags(projectId));

/** Flags of every grid cell of a project that feeds a current error, keyed `${speciesId}:${levelId}`. */
export async function calculationCellFlags(projectId: number): Promise<Map<string, CellFlag[]>> {
  const { models } = db();
  const [species, levels, calculations] = await Promise.all([
    models.Species.findAll({ where: { projectId }, attributes: ["id", "label", "kind"] }),
    models.Level.findAll({ where: { projectId } }),
    models.Calculation.findAll({ where: { projectId }, attributes: ["id", "speciesId", "levelId", "conformerId", "electronicEnergyText", "converged", "frequencies"] }),
  ]);
  const ctx: CellFlagContext = { projectId, species: new Map(species.map((s) => [s.id, s])), levels: new Map(levels.map((l) => [l.id, l])), calculations };
  const all = new Map<string, CellFlag[]>();
  for (const rule of cellFlagRules) {
    for (const [key, flags] of await rule(ctx)) all.set(key, [...(all.get(key) ?? []), ...flags]);
  }
  return all;
}
