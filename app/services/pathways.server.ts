import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Pathway, Species } from "../../db/models/ledger";
import { ServiceError, type ErrorDetail } from "../utils/http.server";
import { recordChange, snapshotOf, type Principal } from "./history.server";
import { optionalBool, refSchema, versionSchema } from "./ledger-input.server";
import { resolveProtocol, type Ref } from "./refs.server";
import { computePathway } from "./ledger-compute.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

/**
 * Pathways: ordered states, each a sum of species with coefficients, drawn against the reference state
 * (the first, unless chosen otherwise); optionally a catalytic cycle. Computed in ledger-compute.server.ts.
 */
const termSchema = z.object({
  species: refSchema("species"),
  coefficient: z.coerce.number({ message: "coefficient must be a number" }).positive("coefficient must be greater than 0").max(1000, "coefficient must be at most 1000").optional(),
});
const stateSchema = z.object({
  label: z.string().trim().max(120, "At most 120 characters").optional(),
  terms: z.array(termSchema).min(1, "A state needs at least one species").max(50, "At most 50 species in a state"),
});
const pathwayFields = {
  name: z.string({ message: "Give the pathway a name" }).trim().min(1, "Give the pathway a name").max(160, "At most 160 characters"),
  states: z.array(stateSchema).min(2, "A pathway needs at least two states").max(200, "At most 200 states"),
  cycle: optionalBool,
  protocol: z.preprocess((v) => (v === "" ? null : v), refSchema("protocol").nullable().optional()),
  referenceState: z.coerce.number().int().min(0, "referenceState is an index from 0").optional(),
};
export const pathwayInputSchema = z.object(pathwayFields);
export const pathwayUpdateSchema = z.object({ ...pathwayFields, name: pathwayFields.name.optional(), states: pathwayFields.states.optional(), version: versionSchema });
export type PathwayInput = z.input<typeof pathwayInputSchema>;
export type PathwayUpdate = z.input<typeof pathwayUpdateSchema>;

/**
 * The pathway form's text: one state per line, `label: A + 2 B` (the label may be left out, then the
 * species make it). Returns states in the API's shape; a bad line is reported by its number.
 */
export function parseStateLines(text: string): { states: Array<{ label?: string; terms: Array<{ species: string; coefficient: number }> }>; errors: ErrorDetail[] } {
  const states: Array<{ label?: string; terms: Array<{ species: string; coefficient: number }> }> = [];
  const errors: ErrorDetail[] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.trim();
    if (!line || line.startsWith("#")) return;
    const colon = line.indexOf(":");
    const label = colon > 0 ? line.slice(0, colon).trim() : undefined;
    const body = colon > 0 ? line.slice(colon + 1).trim() : line;
    if (!body) return void errors.push({ field: `states.${i}`, message: `Line ${i + 1}: no species after the label` });
    const terms: Array<{ species: string; coefficient: number }> = [];
    for (const part of body.split(/\s+\+\s+/)) {
      const m = /^(\d+(?:\.\d+)?)\s+(\S+)$/.exec(part.trim());
      const species = m ? m[2]! : part.trim();
      const coefficient = m ? Number(m[1]) : 1;
      if (!species || /\s/.test(species)) return void errors.push({ field: `states.${i}`, message: `Line ${i + 1}: cannot read “${part.trim()}”; write e.g. “2 B” and separate species with “ + ”` });
      terms.push({ species, coefficient });
    }
    states.push({ label, terms });
  });
  return { states, errors };
}

type ResolvedState = { label: string; terms: Array<{ species: Species; coefficient: number }> };

async function resolveStates(projectId: number, states: z.infer<typeof stateSchema>[], tx: Transaction): Promise<ResolvedState[]> {
  const refs = states.flatMap((s) => s.terms.map((t) => t.species));
  const labels = [...new Set(refs.filter((r): r is string => typeof r === "string"))];
  const ids = [...new Set(refs.filter((r): r is number => typeof r === "number"))];
  const found = await db().models.Species.findAll({
    where: { projectId, [Op.or]: [{ label: { [Op.in]: labels.length ? labels : [""] } }, { id: { [Op.in]: ids.length ? ids : [0] } }] },
    transaction: tx,
  });
  const byLabel = new Map(found.map((s) => [s.label, s]));
  const byId = new Map(found.map((s) => [s.id, s]));
  const details: ErrorDetail[] = [];
  const out: ResolvedState[] = states.map((s, i) => {
    const terms = s.terms.map((t, j) => {
      const sp = typeof t.species === "number" ? byId.get(t.species) : byLabel.get(t.species);
      if (!sp) details.push({ field: `states.${i}.terms.${j}.species`, message: `species ${JSON.stringify(String(t.species))} is not in this project` });
      return { species: sp!, coefficient: t.coefficient ?? 1 };
    });
    const label = s.label?.trim() || terms.map((t) => (t.coefficient === 1 ? t.species?.label : `${t.coefficient} ${t.species?.label}`)).join(" + ");
    return { label, terms };
  });
  if (details.length) throw new ServiceError(422, "unknown_species", `Unknown species: ${[...new Set(details.map((d) => d.message.split('"')[1]))].join(", ")}`, details);
  const seen = new Map<string, number>();
  out.forEach((s, i) => {
    if (seen.has(s.label)) details.push({ field: `states.${i}.label`, message: `State label “${s.label}” is used twice (states ${seen.get(s.label)! + 1} and ${i + 1}); give each state its own label` });
    seen.set(s.label, i);
  });
  if (details.length) throw new ServiceError(422, "invalid_input", details[0]!.message, details);
  return out;
}

async function writeStates(tx: Transaction, pathwayId: number, states: ResolvedState[]) {
  const { PathwayState, PathwayStateTerm } = db().models;
  const old = await PathwayState.findAll({ where: { pathwayId }, attributes: ["id"], transaction: tx });
  if (old.length) {
    await PathwayStateTerm.destroy({ where: { stateId: { [Op.in]: old.map((s) => s.id) } }, transaction: tx });
    await PathwayState.destroy({ where: { pathwayId }, transaction: tx });
  }
  for (const [i, s] of states.entries()) {
    const row = await PathwayState.create({ pathwayId, position: i, label: s.label }, { transaction: tx });
    await PathwayStateTerm.bulkCreate(s.terms.map((t, j) => ({ stateId: row.id, speciesId: t.species.id, coefficient: String(t.coefficient), position: j })), { transaction: tx });
  }
}

const statesSnapshot = (states: ResolvedState[]) => states.map((s) => `${s.label}: ${s.terms.map((t) => `${t.coefficient} ${t.species.label}`).join(" + ")}`);

export function describePathway(p: Pathway, states?: Array<{ label: string; terms: Array<{ species: string; coefficient: number }> }>) {
  return {
    id: p.id,
    name: p.name,
    cycle: p.cycle,
    protocolId: p.protocolId ?? null,
    referenceState: p.referenceState,
    version: p.version,
    ...(states ? { states } : {}),
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

async function assertNameFree(projectId: number, name: string, exceptId: number | null, tx: Transaction) {
  const other = await db().models.Pathway.findOne({ where: { projectId, name }, transaction: tx });
  if (other && other.id !== exceptId) {
    throw new ServiceError(409, "name_taken", `A pathway named “${name}” already exists in this project`, [{ field: "name", message: "already used in this project" }]);
  }
}

function checkReference(ref: number | undefined, count: number) {
  if (ref !== undefined && ref >= count) {
    throw new ServiceError(422, "invalid_input", `referenceState ${ref} is past the last state (${count - 1})`, [{ field: "referenceState", message: `must be between 0 and ${count - 1}` }]);
  }
}

export async function createPathway(project: Project, by: Principal, input: PathwayInput, tx?: Transaction) {
  const data = pathwayInputSchema.parse(input);
  const { sequelize, models } = db();
  const run = async (transaction: Transaction) => {
    await assertNameFree(project.id, data.name, null, transaction);
    const states = await resolveStates(project.id, data.states, transaction);
    checkReference(data.referenceState, states.length);
    const protocol = data.protocol ? await resolveProtocol(project.id, data.protocol as Ref, transaction, "protocol") : null;
    const p = await models.Pathway.create(
      { projectId: project.id, name: data.name, cycle: data.cycle ?? false, protocolId: protocol?.id ?? null, referenceState: data.referenceState ?? 0 },
      { transaction },
    );
    await writeStates(transaction, p.id, states);
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "pathway",
      objectId: p.id,
      summary: `Added pathway “${p.name}” (${states.length} states${p.cycle ? ", cycle" : ""})`,
      newValues: { ...snapshotOf(p), states: statesSnapshot(states) },
    });
    return describePathway(p, states.map((s) => ({ label: s.label, terms: s.terms.map((t) => ({ species: t.species.label, coefficient: t.coefficient })) })));
  };
  return tx ? run(tx) : sequelize.transaction(run);
}

async function findPathway(projectId: number, pathwayId: number, tx?: Transaction) {
  // Locked for the transaction: its states are rewritten before the version bump.
  const p = await db().models.Pathway.findOne({ where: { projectId, id: pathwayId }, transaction: tx, ...(tx ? { lock: tx.LOCK.UPDATE } : {}) });
  if (!p) throw new ServiceError(404, "not_found", "No such pathway in this project");
  return p;
}

export async function updatePathway(project: Project, by: Principal, pathwayId: number, input: PathwayUpdate) {
  const data = pathwayUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const p = await findPathway(project.id, pathwayId, transaction);
    if (version !== undefined && version !== p.version) {
      await updateVersioned(transaction, by, p, version, {}, { projectId: project.id, objectType: "pathway", summary: "" });
    }
    const changes: Partial<Pathway["_attributes"]> = {};
    if (data.name !== undefined && data.name !== p.name) {
      await assertNameFree(project.id, data.name, p.id, transaction);
      changes.name = data.name;
    }
    if (data.cycle !== undefined) changes.cycle = data.cycle;
    if (data.protocol !== undefined) changes.protocolId = data.protocol === null ? null : (await resolveProtocol(project.id, data.protocol as Ref, transaction, "protocol")).id;
    let states: ResolvedState[] | null = null;
    if (data.states) {
      states = await resolveStates(project.id, data.states, transaction);
      await writeStates(transaction, p.id, states);
    }
    const count = states?.length ?? (await models.PathwayState.count({ where: { pathwayId: p.id }, transaction }));
    checkReference(data.referenceState, count);
    if (data.referenceState !== undefined) changes.referenceState = data.referenceState;
    else if (p.referenceState >= count) changes.referenceState = 0;
    const updated = await updateVersioned(transaction, by, p, version, changes, {
      projectId: project.id,
      objectType: "pathway",
      summary: `Changed pathway “${changes.name ?? p.name}”${states ? ` (states now: ${statesSnapshot(states).join("; ")})` : ""}`,
    });
    return describePathway(updated);
  });
}

export async function deletePathway(project: Project, by: Principal, pathwayId: number, version?: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const p = await findPathway(project.id, pathwayId, transaction);
    await assertVersion(transaction, p, version, "pathway", undefined, "decide again");
    const old = snapshotOf(p);
    await writeStates(transaction, p.id, []);
    await p.destroy({ transaction });
    await recordChange(transaction, by, { projectId: project.id, action: "delete", objectType: "pathway", objectId: p.id, summary: `Deleted pathway “${p.name}”`, oldValues: old });
  });
}

export async function listPathways(projectId: number) {
  const { Pathway, PathwayState } = db().models;
  const rows = await Pathway.findAll({ where: { projectId }, order: [["id", "ASC"]] });
  const states = rows.length ? await PathwayState.findAll({ where: { pathwayId: { [Op.in]: rows.map((r) => r.id) } }, attributes: ["pathwayId"] }) : [];
  const byId = new Map<number, number>();
  for (const s of states) byId.set(s.pathwayId, (byId.get(s.pathwayId) ?? 0) + 1);
  return rows.map((p) => ({ ...describePathway(p), stateCount: byId.get(p.id) ?? 0 }));
}

/** The pathway form: name, cycle checkbox, protocol, and the states as lines (see parseStateLines). */
export async function createPathwayFromForm(project: Project, by: Principal, form: Record<string, unknown>) {
  const { states, errors } = parseStateLines(String(form.states ?? ""));
  if (errors.length) throw new ServiceError(422, "invalid_input", errors[0]!.message, errors.map((e) => ({ ...e, field: "states" })));
  return createPathway(project, by, { name: String(form.name ?? ""), cycle: form.cycle as never, protocol: (form.protocol as string) || null, states });
}

/** The pathways page: every pathway with its state count, and the protocols for the form. */
export async function pathwaysPage(projectId: number) {
  const [pathways, protocols] = await Promise.all([
    listPathways(projectId),
    db().models.Protocol.findAll({ where: { projectId }, attributes: ["id", "name"], order: [["id", "ASC"]] }),
  ]);
  return { pathways, protocols: protocols.map((p) => ({ id: p.id, name: p.name })) };
}

/** The pathway page on first paint: the pathway computed under ?protocol= (or its own) and the protocols to compare. */
export async function pathwayPage(projectId: number, pathwayId: number, options: { unit?: string; protocol?: string }) {
  const [answer, protocols] = await Promise.all([
    computePathway(projectId, pathwayId, options),
    db().models.Protocol.findAll({ where: { projectId }, attributes: ["id", "name"], order: [["id", "ASC"]] }),
  ]);
  return { answer, protocols: protocols.map((p) => ({ id: p.id, name: p.name })) };
}
