import { createHash } from "node:crypto";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Snapshot } from "../../db/models/team";
import { ServiceError } from "../utils/http.server";
import { canonicalJson } from "../utils/canonical-json";
import { actorName } from "./comments.server";
import { recordChange, parseJsonColumn, type Principal } from "./history.server";
import { computePathways, computeReactions } from "./ledger-compute.server";

/**
 * Sign-off: an auditor (or owner) freezes the project into a snapshot: every input (levels, species
 * with conformers, calculations, protocols, reactions, pathways) and every computed value under every
 * protocol and in every offered unit, with the audit as it stood. The content is stored as canonical
 * JSON and its SHA-256 is the checksum; a snapshot is written once and this module has no update or
 * delete. Later edits of the live project are found by comparing its inputs with the last snapshot's.
 */
export const SNAPSHOT_FORMAT = "thermotally-snapshot/1";
/** The energy units the ledger offers (PRODUCT.md §3); a snapshot holds its values in each. */
export const SNAPSHOT_UNITS = ["kcal/mol", "kJ/mol", "eV", "cm-1", "hartree"] as const;
/** The computed view without a chosen protocol: each row under its own protocol, else the default. */
export const OWN_PROTOCOLS = "own";

export const signOffSchema = z.object({
  statement: z.string().trim().max(5000, "At most 5000 characters").optional().default(""),
});

export const sha256Hex = (text: string) => createHash("sha256").update(text, "utf8").digest("hex");

// ---------------------------------------------------------------- inputs
const BOOKKEEPING = new Set(["createdAt", "updatedAt", "version", "projectId", "createdBy", "updatedBy", "electronicEnergy"]);

/** A row as plain data for the snapshot: no bookkeeping columns, JSON columns parsed, dates as ISO text. */
function plain(row: { get(o: { plain: true }): object }): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row.get({ plain: true }) as Record<string, unknown>)) {
    if (BOOKKEEPING.has(k)) continue;
    out[k] = v instanceof Date ? v.toISOString() : k === "frequencies" ? parseJsonColumn(v) : v;
  }
  return out;
}

export type SnapshotInputs = {
  project: { name: string; description: string; defaultProtocolId: number | null };
  levels: Record<string, unknown>[];
  species: Record<string, unknown>[];
  calculations: Record<string, unknown>[];
  protocols: Record<string, unknown>[];
  reactions: Record<string, unknown>[];
  pathways: Record<string, unknown>[];
};

/** Every input of a project as plain, ordered data (the part of a snapshot that later edits are compared with). */
export async function readInputs(projectId: number): Promise<SnapshotInputs> {
  const m = db().models;
  const where = { projectId };
  const order: [string, string][] = [["id", "ASC"]];
  const [project, levels, species, calculations, protocols, reactions, pathways] = await Promise.all([
    m.Project.findByPk(projectId),
    m.Level.findAll({ where, order }),
    m.Species.findAll({ where, order, include: [{ model: m.Conformer, as: "conformers" }] }),
    m.Calculation.findAll({ where, order }),
    m.Protocol.findAll({ where, order }),
    m.Reaction.findAll({ where, order, include: [{ model: m.ReactionTerm, as: "terms" }] }),
    m.Pathway.findAll({ where, order, include: [{ model: m.PathwayState, as: "states", include: [{ model: m.PathwayStateTerm, as: "terms" }] }] }),
  ]);
  if (!project) throw new ServiceError(404, "not_found", "No such project");
  const byPosition = (a: { position: number }, b: { position: number }) => a.position - b.position;
  type WithTerms<T> = T & { terms?: { position: number; get(o: { plain: true }): object }[] };
  return {
    project: { name: project.name, description: project.description, defaultProtocolId: project.defaultProtocolId ?? null },
    levels: levels.map(plain),
    species: species.map((s) => {
      const conformers = ((s as unknown as { conformers?: { id: number; get(o: { plain: true }): object }[] }).conformers ?? [])
        .sort((a, b) => a.id - b.id)
        .map((c) => {
          const { speciesId: _s, ...rest } = plain(c);
          return rest;
        });
      return { ...plain(s), conformers };
    }),
    calculations: calculations.map(plain),
    protocols: protocols.map(plain),
    reactions: reactions.map((r) => {
      const terms = ((r as unknown as WithTerms<object>).terms ?? []).sort(byPosition).map((t) => {
        const { id: _i, reactionId: _r, ...rest } = plain(t);
        return rest;
      });
      return { ...plain(r), terms };
    }),
    pathways: pathways.map((p) => {
      const states = ((p as unknown as { states?: WithTerms<{ position: number; get(o: { plain: true }): object }>[] }).states ?? [])
        .sort(byPosition)
        .map((st) => {
          const { id: _i, pathwayId: _p, terms: _t, ...rest } = plain(st);
          const terms = (st.terms ?? []).sort(byPosition).map((t) => {
            const { id: _ti, stateId: _s, ...tr } = plain(t);
            return tr;
          });
          return { ...rest, terms };
        });
      const { states: _s, ...rest } = plain(p);
      return { ...rest, states };
    }),
  };
}

// ---------------------------------------------------------------- computed values
async function computeAll(projectId: number, protocolIds: number[]) {
  const out: Record<string, Record<string, { reactions: unknown; pathways: unknown }>> = {};
  for (const key of [OWN_PROTOCOLS, ...protocolIds.map(String)]) {
    const protocol = key === OWN_PROTOCOLS ? undefined : Number(key);
    out[key] = {};
    for (const unit of SNAPSHOT_UNITS) {
      const [reactions, pathways] = await Promise.all([computeReactions(projectId, { protocol, unit }), computePathways(projectId, { protocol, unit })]);
      out[key][unit] = { reactions, pathways: pathways.pathways };
    }
  }
  return out;
}

/** Extra parts of a snapshot (the audit as it stood, say), added by the modules that own them. */
export const snapshotContentProviders: ((project: Project) => Promise<Record<string, unknown>>)[] = [];

export type SnapshotContent = {
  format: string;
  project: SnapshotInputs["project"] & { id: number };
  inputs: Omit<SnapshotInputs, "project">;
  /** computed[protocolId | "own"][unit] = {reactions: the reactions answer, pathways: [pathway answers]} */
  computed: Record<string, Record<string, { reactions: ReactionsAnswer; pathways: PathwayAnswer[] }>>;
  [extra: string]: unknown;
};
export type ReactionsAnswer = Awaited<ReturnType<typeof computeReactions>>;
export type PathwayAnswer = Awaited<ReturnType<typeof computePathways>>["pathways"][number];

// ---------------------------------------------------------------- snapshots
function describeSnapshot(s: Snapshot) {
  return {
    id: s.id,
    projectId: s.projectId,
    signer: actorName(s.signerLabel),
    signerId: s.signedBy,
    signedAt: s.signedAt.toISOString(),
    statement: s.statement,
    checksum: s.checksum,
  };
}
export type SnapshotSummary = ReturnType<typeof describeSnapshot>;

export async function signOff(project: Project, by: Principal, input: z.input<typeof signOffSchema>): Promise<SnapshotSummary> {
  const { statement } = signOffSchema.parse(input);
  const { sequelize, models } = db();
  // Inputs and values are read before the transaction opens: the computation reads through its own
  // connections, and the content is checked against the inputs once more inside (a concurrent edit
  // between the two reads is refused rather than frozen half-and-half).
  const inputs = await readInputs(project.id);
  const computed = await computeAll(project.id, inputs.protocols.map((p) => Number(p.id)));
  const extras: Record<string, unknown> = {};
  for (const provider of snapshotContentProviders) Object.assign(extras, await provider(project));
  const { project: projectInputs, ...rest } = inputs;
  const content = { ...extras, format: SNAPSHOT_FORMAT, project: { id: project.id, ...projectInputs }, inputs: rest, computed };
  const text = canonicalJson(content);
  const checksum = sha256Hex(text);
  return sequelize.transaction(async (transaction) => {
    await models.Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (canonicalJson(await readInputs(project.id)) !== canonicalJson(inputs)) {
      throw new ServiceError(409, "changed_during_sign_off", "The project changed while it was being signed off; sign off again");
    }
    // Whole seconds: the column keeps no fraction, so what is answered now reads the same later.
    const signedAt = new Date(Math.floor(Date.now() / 1000) * 1000);
    const row = await models.Snapshot.create(
      { projectId: project.id, signedBy: by.userId, signerLabel: by.label, signedAt, statement, checksum, content: text },
      { transaction },
    );
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "snapshot",
      objectId: row.id,
      summary: `Signed off snapshot #${row.id} (checksum ${checksum.slice(0, 12)}…)${statement ? `: ${statement}` : ""}`,
      newValues: { checksum, statement, signedAt: signedAt.toISOString() },
    });
    return describeSnapshot(row);
  });
}

export async function listSnapshots(projectId: number): Promise<SnapshotSummary[]> {
  const rows = await db().models.Snapshot.findAll({
    where: { projectId },
    attributes: { exclude: ["content"] },
    order: [["id", "DESC"]],
  });
  return rows.map(describeSnapshot);
}

export type SnapshotFull = SnapshotSummary & { content: SnapshotContent; intact: boolean };

// Snapshots never change, so their parsed content can be kept (a few, by id and checksum).
const parsedCache = new Map<string, SnapshotFull>();

/** A snapshot row with its parsed content; `intact` says whether the stored text still matches its checksum. */
export function withContent(row: Snapshot): SnapshotFull {
  const key = `${row.id}:${row.checksum}:${row.content.length}`;
  const hit = parsedCache.get(key);
  if (hit) return hit;
  const full = { ...describeSnapshot(row), content: JSON.parse(row.content) as SnapshotContent, intact: sha256Hex(row.content) === row.checksum };
  if (parsedCache.size >= 16) parsedCache.delete(parsedCache.keys().next().value!);
  parsedCache.set(key, full);
  return full;
}

/** A snapshot with its frozen content; `intact` says whether the stored text still matches its checksum. */
export async function getSnapshot(projectId: number, snapshotId: number): Promise<SnapshotFull> {
  const row = await db().models.Snapshot.findOne({ where: { id: snapshotId, projectId } });
  if (!row) throw new ServiceError(404, "not_found", "No such snapshot in this project");
  return withContent(row);
}

export async function latestSnapshot(projectId: number): Promise<SnapshotFull | null> {
  const row = await db().models.Snapshot.findOne({ where: { projectId }, order: [["id", "DESC"]] });
  return row ? withContent(row) : null;
}

// ---------------------------------------------------------------- what changed since
const COLLECTIONS = ["levels", "species", "calculations", "protocols", "reactions", "pathways"] as const;
type Collection = (typeof COLLECTIONS)[number];

export type FieldChange = { field: string; before: unknown; after: unknown };
export type ObjectChange = { collection: Collection; id: number; label: string; change: "added" | "removed" | "changed"; fields: FieldChange[] };

function labelOf(collection: Collection, row: Record<string, unknown>, inputs: SnapshotInputs): string {
  switch (collection) {
    case "levels":
      return String(row.key ?? `level #${row.id}`);
    case "species":
      return String(row.label ?? `species #${row.id}`);
    case "calculations": {
      const sp = inputs.species.find((s) => s.id === row.speciesId);
      const lv = inputs.levels.find((l) => l.id === row.levelId);
      return `${sp?.label ?? `species #${row.speciesId}`} at ${lv?.key ?? `level #${row.levelId}`}`;
    }
    case "protocols":
    case "pathways":
      return String(row.name ?? `#${row.id}`);
    case "reactions":
      return String(row.equation ?? `reaction #${row.id}`);
  }
}

/** Added, removed and changed objects between two sets of inputs, field by field. */
export function diffInputs(before: SnapshotInputs, after: SnapshotInputs): ObjectChange[] {
  const changes: ObjectChange[] = [];
  for (const collection of COLLECTIONS) {
    const old = new Map(before[collection].map((r) => [Number(r.id), r]));
    const now = new Map(after[collection].map((r) => [Number(r.id), r]));
    for (const [id, row] of now) {
      const was = old.get(id);
      if (!was) {
        changes.push({ collection, id, label: labelOf(collection, row, after), change: "added", fields: [] });
        continue;
      }
      const fields: FieldChange[] = [];
      for (const field of new Set([...Object.keys(was), ...Object.keys(row)])) {
        if (canonicalJson(was[field] ?? null) !== canonicalJson(row[field] ?? null)) fields.push({ field, before: was[field] ?? null, after: row[field] ?? null });
      }
      if (fields.length) changes.push({ collection, id, label: labelOf(collection, row, after), change: "changed", fields });
    }
    for (const [id, row] of old) {
      if (!now.has(id)) changes.push({ collection, id, label: labelOf(collection, row, before), change: "removed", fields: [] });
    }
  }
  const project = (["name", "description", "defaultProtocolId"] as const).filter((f) => canonicalJson(before.project[f]) !== canonicalJson(after.project[f]));
  if (project.length) {
    changes.unshift({
      collection: "protocols",
      id: 0,
      label: "project settings",
      change: "changed",
      fields: project.map((f) => ({ field: f, before: before.project[f], after: after.project[f] })),
    });
  }
  return changes;
}

export function inputsOf(content: SnapshotContent): SnapshotInputs {
  const { id: _id, ...project } = content.project;
  return { project, ...content.inputs };
}

/** The unit and the quantities in which computed values are compared with the last sign-off. */
export const COMPARED_UNIT = "kcal/mol";
const COMPARED_VALUES = ["deltaE", "deltaEZPE", "deltaH", "deltaG", "barrierE", "barrierG"] as const;

export type ValueChange = { reactionId: number; reaction: string; quantity: string; before: number | string | null; after: number | string | null };

/**
 * Computed values of the reactions present in both answers that differ (each row under its own
 * protocol): a changed energy shows up here as the ΔG it moved, not only as the edited input.
 */
export function diffValues(before: ReactionsAnswer, after: ReactionsAnswer): ValueChange[] {
  const was = new Map(before.reactions.map((r) => [r.id, r]));
  const out: ValueChange[] = [];
  for (const now of after.reactions) {
    const old = was.get(now.id);
    if (!old) continue;
    if (old.status !== now.status) out.push({ reactionId: now.id, reaction: now.equation, quantity: "status", before: old.status, after: now.status });
    for (const q of COMPARED_VALUES) {
      const a = (old.values as Record<string, number | null>)[q] ?? null;
      const b = (now.values as Record<string, number | null>)[q] ?? null;
      if (a !== b) out.push({ reactionId: now.id, reaction: now.equation, quantity: q, before: a, after: b });
    }
  }
  return out;
}

/**
 * The last sign-off and what changed in the live project since; null when it was never signed off.
 * `values: false` skips recomputing the ledger (the banner and the audit need only the inputs).
 */
export async function changesSinceSignOff(projectId: number, options: { values?: boolean } = {}) {
  const last = await latestSnapshot(projectId);
  if (!last) return null;
  const changes = diffInputs(inputsOf(last.content), await readInputs(projectId));
  const frozen = last.content.computed[OWN_PROTOCOLS]?.[COMPARED_UNIT]?.reactions;
  // Values can only have moved when an input did; recomputing is skipped otherwise.
  const valueChanges = options.values !== false && changes.length && frozen ? diffValues(frozen, await computeReactions(projectId, { unit: COMPARED_UNIT })) : [];
  const { content: _c, ...snapshot } = last;
  return { snapshot, outdated: changes.length > 0, changes, valueUnit: COMPARED_UNIT, valueChanges };
}
export type ChangesSinceSignOff = Awaited<ReturnType<typeof changesSinceSignOff>>;

/** For the banner on project pages: the last sign-off and whether edits have outdated it. */
export async function signOffStatus(projectId: number) {
  const c = await changesSinceSignOff(projectId, { values: false });
  if (!c) return null;
  return { snapshotId: c.snapshot.id, signedAt: c.snapshot.signedAt, signer: c.snapshot.signer, outdated: c.outdated, changeCount: c.changes.length };
}
export type SignOffStatus = Awaited<ReturnType<typeof signOffStatus>>;
