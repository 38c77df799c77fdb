import { Op, QueryTypes, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Conformer, Species } from "../../db/models/ledger";
import {
  assertMultiplicity, electronCount, formulaFromSmiles, hillFormula, parseFormula, parseXyz, type ElementCounts,
} from "../domain/thermo";
import { ServiceError } from "../utils/http.server";
import { SPECIES_KINDS } from "../utils/ledger-vocab";
import { parseJsonColumn, recordChange, snapshotOf, type Principal } from "./history.server";
import { nullableText, optionalInt, optionalNumber, versionSchema } from "./ledger-input.server";
import { fromThermo, invalidField, resolveSpecies, type Ref } from "./refs.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

export { SPECIES_KINDS };

/** Labels appear in equations (`A + 2 B -> C`): no spaces, no arrows. */
const labelSchema = z
  .string({ message: "Give the species a label" })
  .trim()
  .min(1, "Give the species a label")
  .max(80, "At most 80 characters")
  .refine((v) => !/\s/.test(v), "A label has no spaces (it is used in equations such as A + 2 B -> C)")
  .refine((v) => !/->|→|=>/.test(v) && v !== "+", "A label cannot contain an arrow or be a lone +");

/** Geometry as `{format: "xyz", data}` (API) or as bare XYZ text (forms). */
const geometrySchema = z.preprocess(
  (v) => (v === "" ? null : typeof v === "string" ? { format: "xyz", data: v } : v),
  z.object({ format: z.literal("xyz", { message: "Only XYZ geometries are accepted" }).default("xyz"), data: z.string().max(2_000_000, "Geometry too large") }).nullable().optional(),
);

const speciesFields = {
  label: labelSchema,
  formula: nullableText(200),
  smiles: nullableText(1000),
  charge: optionalInt("charge", -20, 20),
  multiplicity: optionalInt("multiplicity", 1, 20),
  kind: z.preprocess((v) => (v === "" || v === null ? undefined : v === "ts" || v === "TS" ? "transition-state" : v), z.enum(SPECIES_KINDS, { message: "kind is minimum or transition-state" }).optional()),
  symmetryNumber: optionalInt("symmetryNumber", 1, 120),
  geometry: geometrySchema,
  concentrationMolL: z.preprocess((v) => (v === "" ? null : v), z.union([z.null(), optionalNumber("concentrationMolL", { positive: true, max: 100000 })])).optional(),
  notes: z.string().max(5000, "At most 5000 characters").optional(),
};
export const speciesInputSchema = z.object(speciesFields);
export const speciesUpdateSchema = z.object({ ...speciesFields, label: labelSchema.optional(), version: versionSchema });
export type SpeciesInput = z.input<typeof speciesInputSchema>;
export type SpeciesUpdate = z.input<typeof speciesUpdateSchema>;

export const conformerInputSchema = z.object({
  label: labelSchema,
  geometry: geometrySchema,
});
export const conformerUpdateSchema = z.object({ label: labelSchema.optional(), geometry: geometrySchema, version: versionSchema });

type Resolved = {
  formula: string;
  smiles: string | null;
  charge: number;
  multiplicity: number;
  counts: ElementCounts;
};

/** Formula from the SMILES (or as typed), the charge, and the multiplicity the electron count allows. */
/** Formula, SMILES, charge and multiplicity checked against each other; shared by typed edits and imports. */
export function resolveComposition(v: { formula?: string | null; smiles?: string | null; charge?: number; multiplicity?: number }, chargeGiven: boolean): Resolved {
  const smiles = v.smiles?.trim() || null;
  const typed = v.formula?.trim() || null;
  let counts: ElementCounts | null = null;
  let charge = v.charge ?? 0;
  if (smiles) {
    const fromSmiles = fromThermo("smiles", () => formulaFromSmiles(smiles));
    counts = fromSmiles.counts;
    if (typed) {
      const parsed = fromThermo("formula", () => parseFormula(typed));
      const diff = countDifferences(parsed.counts, counts, "the formula", "the SMILES");
      if (diff) throw invalidField("formula", `The formula ${typed} does not match the SMILES (${hillFormula(counts)}): ${diff}`);
    }
    if (!chargeGiven) charge = fromSmiles.charge;
    else if (fromSmiles.charge !== charge) throw invalidField("charge", `charge ${charge} differs from the SMILES's net charge ${fromSmiles.charge}`);
  } else if (typed) {
    const parsed = fromThermo("formula", () => parseFormula(typed));
    counts = parsed.counts;
    if (parsed.charge !== 0) {
      if (!chargeGiven) charge = parsed.charge;
      else if (parsed.charge !== charge) throw invalidField("charge", `charge ${charge} differs from the charge written in the formula (${parsed.charge})`);
    }
  } else {
    throw new ServiceError(422, "invalid_input", "Give a formula or a SMILES", [{ field: "formula", message: "Give a formula or a SMILES" }]);
  }
  const multiplicity = v.multiplicity ?? 1;
  const electrons = fromThermo("charge", () => electronCount(counts!, charge));
  fromThermo("multiplicity", () => assertMultiplicity(electrons, multiplicity));
  return { formula: hillFormula(counts!), smiles, charge, multiplicity, counts: counts! };
}

/** "geometry has 5 C, the formula 6" style differences between two element counts, or "" when equal. */
export function countDifferences(a: ElementCounts, b: ElementCounts, aName: string, bName: string): string {
  const out: string[] = [];
  for (const el of [...new Set([...Object.keys(a), ...Object.keys(b)])].sort()) {
    const x = a[el] ?? 0;
    const y = b[el] ?? 0;
    if (x !== y) out.push(`${el}: ${x} in ${aName}, ${y} in ${bName}`);
  }
  return out.join("; ");
}

/** Validates XYZ text (one structure) and, when the formula is known, that its atoms match it. */
export function checkGeometry(data: string, counts: ElementCounts | null, field = "geometry"): string {
  const frames = fromThermo(field, () => parseXyz(data));
  if (frames.length !== 1) throw invalidField(field, `The XYZ text holds ${frames.length} structures; store one geometry (the last frame of an optimisation)`);
  const g = frames[0]!;
  if (counts) {
    const atoms: ElementCounts = {};
    for (const s of g.symbols) atoms[s] = (atoms[s] ?? 0) + 1;
    const diff = countDifferences(atoms, counts, "the geometry", "the formula");
    if (diff) throw invalidField(field, `The geometry's atoms do not match the formula ${hillFormula(counts)}: ${diff}`);
  }
  // Stored as a standard XYZ block so that exports and the thermochemistry read one shape.
  const lines = g.coordinates.map((c, i) => `${g.symbols[i]!.padEnd(2)} ${c.map((x) => x.toFixed(6).padStart(12)).join(" ")}`);
  return `${g.symbols.length}\n${g.comment ?? ""}\n${lines.join("\n")}\n`;
}

export function countsOf(species: Pick<Species, "formula" | "smiles">): ElementCounts | null {
  try {
    if (species.smiles) return formulaFromSmiles(species.smiles).counts;
    if (species.formula) return parseFormula(species.formula).counts;
  } catch {
    /* an unreadable stored formula is the audit's business, not a reason to fail a read */
  }
  return null;
}

export type SpeciesExtras = { conformerCount: number; imaginaryModes: number | null; frequencyCalculationId: number | null };

export function describeSpecies(s: Species, extras?: Partial<SpeciesExtras>) {
  return {
    id: s.id,
    label: s.label,
    formula: s.formula ?? null,
    smiles: s.smiles ?? null,
    charge: s.charge,
    multiplicity: s.multiplicity,
    kind: s.kind,
    symmetryNumber: s.symmetryNumber,
    geometry: s.geometryXyz ? { format: "xyz" as const, data: s.geometryXyz } : null,
    hasGeometry: !!s.geometryXyz,
    concentrationMolL: s.concentrationMolL === null || s.concentrationMolL === undefined ? null : Number(s.concentrationMolL),
    notes: s.notes ?? "",
    conformerCount: extras?.conformerCount ?? 0,
    imaginaryModes: extras?.imaginaryModes ?? null,
    version: s.version,
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
  };
}
export type SpeciesView = ReturnType<typeof describeSpecies>;

export function describeConformer(c: Conformer) {
  return {
    id: c.id,
    speciesId: c.speciesId,
    label: c.label,
    geometry: c.geometryXyz ? { format: "xyz" as const, data: c.geometryXyz } : null,
    version: c.version,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

/** Imaginary modes (negative wavenumbers) in a stored frequency list. */
export const imaginaryCount = (frequencies: unknown): number | null => {
  const list = parseJsonColumn(frequencies);
  return Array.isArray(list) ? list.filter((f) => typeof f === "number" && f < 0).length : null;
};

/** Per species: conformer count and the imaginary modes of its latest calculation with frequencies. */
async function speciesExtras(projectId: number, speciesIds?: number[]): Promise<Map<number, SpeciesExtras>> {
  const { sequelize } = db();
  const filter = speciesIds ? ` AND species_id IN (${speciesIds.map(Number).join(",") || "0"})` : "";
  const [conformers, calcs] = await Promise.all([
    sequelize.query<{ speciesId: number; n: number }>(
      `SELECT c.species_id AS speciesId, COUNT(*) AS n FROM conformers c JOIN species s ON s.id = c.species_id WHERE s.project_id = ?${filter.replace("species_id", "c.species_id")} GROUP BY c.species_id`,
      { type: QueryTypes.SELECT, replacements: [projectId] },
    ),
    sequelize.query<{ id: number; speciesId: number; frequencies: unknown }>(
      `SELECT id, species_id AS speciesId, frequencies FROM calculations WHERE project_id = ? AND frequencies IS NOT NULL${filter} ORDER BY updated_at, id`,
      { type: QueryTypes.SELECT, replacements: [projectId] },
    ),
  ]);
  const out = new Map<number, SpeciesExtras>();
  const get = (id: number) => {
    let e = out.get(id);
    if (!e) out.set(id, (e = { conformerCount: 0, imaginaryModes: null, frequencyCalculationId: null }));
    return e;
  };
  for (const c of conformers) get(c.speciesId).conformerCount = Number(c.n);
  for (const c of calcs) {
    const e = get(c.speciesId);
    e.imaginaryModes = imaginaryCount(c.frequencies);
    e.frequencyCalculationId = c.id;
  }
  return out;
}

export async function listSpecies(projectId: number) {
  const [rows, extras] = await Promise.all([
    db().models.Species.findAll({ where: { projectId }, order: [["id", "ASC"]] }),
    speciesExtras(projectId),
  ]);
  return rows.map((s) => describeSpecies(s, extras.get(s.id)));
}

/** One species with its conformers (the species page and GET /species/:id). */
export async function getSpecies(projectId: number, ref: Ref) {
  const s = await resolveSpecies(projectId, ref, undefined, "speciesId");
  const [extras, conformers] = await Promise.all([
    speciesExtras(projectId, [s.id]),
    db().models.Conformer.findAll({ where: { speciesId: s.id }, order: [["id", "ASC"]] }),
  ]);
  return { ...describeSpecies(s, extras.get(s.id)), conformers: conformers.map(describeConformer) };
}

async function assertLabelFree(projectId: number, label: string, exceptId: number | null, tx: Transaction) {
  const clash = await db().models.Species.findOne({ where: { projectId, label, ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}) }, transaction: tx });
  if (clash) throw new ServiceError(409, "duplicate_label", `A species labelled ${label} already exists in this project`, [{ field: "label", message: `${label} is already used` }]);
}

function speciesRow(data: z.output<typeof speciesUpdateSchema>, merged: { formula: string | null; smiles: string | null; charge: number; multiplicity: number; geometryXyz: string | null }, chargeGiven: boolean) {
  const c = resolveComposition(merged, chargeGiven);
  const geometryXyz = merged.geometryXyz ? checkGeometry(merged.geometryXyz, c.counts) : null;
  return {
    formula: c.formula,
    smiles: c.smiles,
    charge: c.charge,
    multiplicity: c.multiplicity,
    geometryXyz,
    ...(data.kind !== undefined ? { kind: data.kind } : {}),
    ...(data.symmetryNumber !== undefined ? { symmetryNumber: data.symmetryNumber } : {}),
    ...(data.concentrationMolL !== undefined ? { concentrationMolL: data.concentrationMolL === null ? null : String(data.concentrationMolL) } : {}),
    ...(data.notes !== undefined ? { notes: data.notes } : {}),
  };
}

export async function createSpecies(project: Project, by: Principal, input: SpeciesInput, tx?: Transaction) {
  const data = speciesInputSchema.parse(input);
  const row = speciesRow(
    data,
    { formula: data.formula ?? null, smiles: data.smiles ?? null, charge: data.charge ?? 0, multiplicity: data.multiplicity ?? 1, geometryXyz: data.geometry?.data ?? null },
    data.charge !== undefined,
  );
  const { sequelize, models } = db();
  const run = async (transaction: Transaction) => {
    await assertLabelFree(project.id, data.label, null, transaction);
    const s = await models.Species.create({ projectId: project.id, label: data.label, notes: "", ...row }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "species",
      objectId: s.id,
      summary: `Added species ${s.label} (${s.formula})`,
      newValues: snapshotOf(s),
    });
    return describeSpecies(s);
  };
  return tx ? run(tx) : sequelize.transaction(run);
}

export async function updateSpecies(project: Project, by: Principal, ref: Ref, input: SpeciesUpdate) {
  const data = speciesUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const s = await resolveSpecies(project.id, ref, transaction, "speciesId");
    if (version !== undefined && version !== s.version) {
      // Refused before validation so that a stale edit reports the conflict, not a side effect of the old row.
      await updateVersioned(transaction, by, s, version, {}, { projectId: project.id, objectType: "species", summary: "" });
    }
    if (data.label !== undefined && data.label !== s.label) await assertLabelFree(project.id, data.label, s.id, transaction);
    // A new SMILES replaces the derived formula; a new formula alone clears nothing else.
    const smiles = data.smiles !== undefined ? data.smiles : s.smiles;
    const formula = data.formula !== undefined ? data.formula : data.smiles !== undefined && data.smiles ? null : smiles ? null : s.formula;
    const row = speciesRow(
      data,
      {
        formula,
        smiles: smiles ?? null,
        charge: data.charge ?? s.charge,
        multiplicity: data.multiplicity ?? s.multiplicity,
        geometryXyz: data.geometry !== undefined ? (data.geometry?.data ?? null) : (s.geometryXyz ?? null),
      },
      data.charge !== undefined || (data.smiles === undefined && data.formula === undefined),
    );
    const updated = await updateVersioned(transaction, by, s, version, { ...row, ...(data.label !== undefined ? { label: data.label } : {}) }, {
      projectId: project.id,
      objectType: "species",
      summary: `Changed species ${s.label}`,
    });
    const extras = await speciesExtras(project.id, [updated.id]);
    return describeSpecies(updated, extras.get(updated.id));
  });
}

/**
 * Deletes a species with its conformers and calculations, unless a reaction or pathway uses it; with
 * `version`, only if it is still the one the caller saw (else 409 with the current values).
 */
export async function deleteSpecies(project: Project, by: Principal, ref: Ref, version?: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const s = await resolveSpecies(project.id, ref, transaction, "speciesId");
    await assertVersion(transaction, s, version, "species", undefined, "decide again");
    const [terms, asTs, states] = await Promise.all([
      models.ReactionTerm.count({ where: { speciesId: s.id }, transaction }),
      models.Reaction.count({ where: { transitionStateId: s.id }, transaction }),
      models.PathwayStateTerm.count({ where: { speciesId: s.id }, transaction }),
    ]);
    if (terms || asTs || states) {
      throw new ServiceError(409, "species_in_use", `Species ${s.label} is used by ${terms + asTs} reaction term(s) and ${states} pathway state term(s); remove it from those first`);
    }
    const calcs = await models.Calculation.count({ where: { speciesId: s.id }, transaction });
    const old = snapshotOf(s);
    await s.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "delete",
      objectType: "species",
      objectId: s.id,
      summary: `Deleted species ${s.label}${calcs ? ` with its ${calcs} calculation(s)` : ""}`,
      oldValues: old,
    });
  });
}

// ---------- conformers ----------

async function findConformer(species: Species, ref: Ref, tx?: Transaction, field = "conformer") {
  const { Conformer } = db().models;
  const byLabel = typeof ref === "string" ? await Conformer.findOne({ where: { speciesId: species.id, label: ref }, transaction: tx }) : null;
  if (byLabel) return byLabel;
  const id = typeof ref === "number" ? ref : /^\d+$/.test(ref) ? Number(ref) : null;
  const byId = id ? await Conformer.findOne({ where: { speciesId: species.id, id }, transaction: tx }) : null;
  if (byId) return byId;
  const message = `conformer ${JSON.stringify(String(ref))} is not a conformer of ${species.label}`;
  // From the URL: a resource that is not there (404); from a body: bad input naming the field (422).
  throw new ServiceError(field === "conformerId" ? 404 : 422, field === "conformerId" ? "not_found" : "unknown_reference", message, [{ field, message }]);
}
export { findConformer as resolveConformer };

export async function createConformer(project: Project, by: Principal, speciesRef: Ref, input: z.input<typeof conformerInputSchema>) {
  const data = conformerInputSchema.parse(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const s = await resolveSpecies(project.id, speciesRef, transaction, "speciesId");
    const geometryXyz = data.geometry?.data ? checkGeometry(data.geometry.data, countsOf(s)) : null;
    if (await models.Conformer.findOne({ where: { speciesId: s.id, label: data.label }, transaction })) {
      throw new ServiceError(409, "duplicate_label", `${s.label} already has a conformer ${data.label}`, [{ field: "label", message: `${data.label} is already used` }]);
    }
    const c = await models.Conformer.create({ speciesId: s.id, label: data.label, geometryXyz }, { transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "conformer",
      objectId: c.id,
      summary: `Added conformer ${c.label} of ${s.label}`,
      newValues: snapshotOf(c),
    });
    return describeConformer(c);
  });
}

export async function updateConformer(project: Project, by: Principal, speciesRef: Ref, conformerRef: Ref, input: z.input<typeof conformerUpdateSchema>) {
  const data = conformerUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const s = await resolveSpecies(project.id, speciesRef, transaction, "speciesId");
    const c = await findConformer(s, conformerRef, transaction, "conformerId");
    const changes: Partial<Conformer["_attributes"]> = {};
    if (data.geometry !== undefined) changes.geometryXyz = data.geometry?.data ? checkGeometry(data.geometry.data, countsOf(s)) : null;
    if (data.label !== undefined && data.label !== c.label) {
      if (await models.Conformer.findOne({ where: { speciesId: s.id, label: data.label }, transaction })) {
        throw new ServiceError(409, "duplicate_label", `${s.label} already has a conformer ${data.label}`, [{ field: "label", message: `${data.label} is already used` }]);
      }
      changes.label = data.label;
    }
    const updated = await updateVersioned(transaction, by, c, version, changes, { projectId: project.id, objectType: "conformer", summary: `Changed conformer ${c.label} of ${s.label}` });
    return describeConformer(updated);
  });
}

export async function deleteConformer(project: Project, by: Principal, speciesRef: Ref, conformerRef: Ref, version?: number) {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const s = await resolveSpecies(project.id, speciesRef, transaction, "speciesId");
    const c = await findConformer(s, conformerRef, transaction, "conformerId");
    await assertVersion(transaction, c, version, "conformer", undefined, "decide again");
    const old = snapshotOf(c);
    await c.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "delete",
      objectType: "conformer",
      objectId: c.id,
      summary: `Deleted conformer ${c.label} of ${s.label} (and its calculations)`,
      oldValues: old,
    });
  });
}

