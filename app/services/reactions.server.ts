import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Reaction, Species } from "../../db/models/ledger";
import { parseEquation, type ParsedEquation } from "../domain/thermo";
import { ServiceError } from "../utils/http.server";
import { recordChange, snapshotOf, type Principal } from "./history.server";
import { refSchema, versionSchema } from "./ledger-input.server";
import { fromThermo, resolveProtocol, resolveSpecies, type Ref } from "./refs.server";
import { computeReactions } from "./ledger-compute.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

/**
 * Reactions: an equation over the project's species (`A + 2 B -> C`, also →), an optional transition
 * state and an optional protocol of their own. The computed values live in ledger-compute.server.ts.
 */
const nullableRef = (field: string) => z.preprocess((v) => (v === "" ? null : v), refSchema(field).nullable().optional());
export const reactionInputSchema = z.object({
  equation: z.string({ message: 'Write the equation, e.g. "A + 2 B -> C"' }).trim().min(1, 'Write the equation, e.g. "A + 2 B -> C"').max(1900, "At most 1900 characters"),
  transitionState: nullableRef("transitionState"),
  protocol: nullableRef("protocol"),
  notes: z.string().max(5000, "At most 5000 characters").optional(),
});
export const reactionUpdateSchema = reactionInputSchema.partial().extend({ version: versionSchema });
export type ReactionInput = z.input<typeof reactionInputSchema>;
export type ReactionUpdate = z.input<typeof reactionUpdateSchema>;

type ResolvedTerm = { species: Species; side: "reactant" | "product"; coefficient: number };

/** The equation as stored: "A + 2 B -> C" (coefficient 1 left out, one arrow spelling). */
export function formatEquation(parsed: ParsedEquation): string {
  const side = (terms: ParsedEquation["reactants"]) => terms.map((t) => (t.coefficient === 1 ? t.label : `${+t.coefficient.toFixed(6)} ${t.label}`)).join(" + ");
  return `${side(parsed.reactants)} ${parsed.reversible ? "<=>" : "->"} ${side(parsed.products)}`;
}

/** Parses an equation and finds every species; unknown labels are listed all at once (422 on `equation`). */
export async function resolveEquation(projectId: number, equation: string, tx?: Transaction): Promise<{ text: string; terms: ResolvedTerm[] }> {
  const parsed = fromThermo("equation", () => parseEquation(equation));
  const labels = [...new Set([...parsed.reactants, ...parsed.products].map((t) => t.label))];
  const found = await db().models.Species.findAll({ where: { projectId, label: { [Op.in]: labels } }, transaction: tx });
  const byLabel = new Map(found.map((s) => [s.label, s]));
  const unknown = labels.filter((l) => !byLabel.has(l));
  if (unknown.length) {
    const message = `Unknown species: ${unknown.join(", ")} — add ${unknown.length === 1 ? "it" : "them"} on the species page first (labels compare exactly, case included)`;
    throw new ServiceError(422, "unknown_species", message, [{ field: "equation", message, unknown }]);
  }
  const terms: ResolvedTerm[] = [
    ...parsed.reactants.map((t) => ({ species: byLabel.get(t.label)!, side: "reactant" as const, coefficient: t.coefficient })),
    ...parsed.products.map((t) => ({ species: byLabel.get(t.label)!, side: "product" as const, coefficient: t.coefficient })),
  ];
  return { text: formatEquation(parsed), terms };
}

async function writeTerms(tx: Transaction, reactionId: number, terms: ResolvedTerm[]) {
  const { ReactionTerm } = db().models;
  await ReactionTerm.destroy({ where: { reactionId }, transaction: tx });
  await ReactionTerm.bulkCreate(
    terms.map((t, i) => ({ reactionId, speciesId: t.species.id, side: t.side, coefficient: String(t.coefficient), position: i })),
    { transaction: tx },
  );
}

export function describeReaction(r: Reaction, extras: { transitionState?: string | null; protocol?: string | null } = {}) {
  return {
    id: r.id,
    equation: r.equation,
    transitionStateId: r.transitionStateId ?? null,
    transitionState: extras.transitionState ?? null,
    protocolId: r.protocolId ?? null,
    protocol: extras.protocol ?? null,
    notes: r.notes,
    version: r.version,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  };
}

async function extrasOf(r: Reaction, tx?: Transaction) {
  const { Species, Protocol } = db().models;
  const [ts, p] = await Promise.all([
    r.transitionStateId ? Species.findByPk(r.transitionStateId, { transaction: tx, attributes: ["label"] }) : null,
    r.protocolId ? Protocol.findByPk(r.protocolId, { transaction: tx, attributes: ["name"] }) : null,
  ]);
  return { transitionState: ts?.label ?? null, protocol: p?.name ?? null };
}

async function findReaction(projectId: number, reactionId: number, tx?: Transaction) {
  // Locked for the transaction: its terms are rewritten before the version bump.
  const r = await db().models.Reaction.findOne({ where: { projectId, id: reactionId }, transaction: tx, ...(tx ? { lock: tx.LOCK.UPDATE } : {}) });
  if (!r) throw new ServiceError(404, "not_found", "No such reaction in this project");
  return r;
}

export async function getReaction(projectId: number, reactionId: number) {
  const r = await findReaction(projectId, reactionId);
  return describeReaction(r, await extrasOf(r));
}

export async function createReaction(project: Project, by: Principal, input: ReactionInput, tx?: Transaction) {
  const data = reactionInputSchema.parse(input);
  const { sequelize, models } = db();
  const run = async (transaction: Transaction) => {
    const { text, terms } = await resolveEquation(project.id, data.equation, transaction);
    const ts = data.transitionState ? await resolveSpecies(project.id, data.transitionState as Ref, transaction, "transitionState") : null;
    const protocol = data.protocol ? await resolveProtocol(project.id, data.protocol as Ref, transaction, "protocol") : null;
    const r = await models.Reaction.create(
      { projectId: project.id, equation: text, transitionStateId: ts?.id ?? null, protocolId: protocol?.id ?? null, notes: data.notes ?? "" },
      { transaction },
    );
    await writeTerms(transaction, r.id, terms);
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "create",
      objectType: "reaction",
      objectId: r.id,
      summary: `Added reaction ${text}${ts ? ` via ${ts.label}` : ""}`,
      newValues: { ...snapshotOf(r), transitionState: ts?.label ?? null, protocol: protocol?.name ?? null },
    });
    return describeReaction(r, { transitionState: ts?.label ?? null, protocol: protocol?.name ?? null });
  };
  return tx ? run(tx) : sequelize.transaction(run);
}

export async function updateReaction(project: Project, by: Principal, reactionId: number, input: ReactionUpdate) {
  const data = reactionUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const r = await findReaction(project.id, reactionId, transaction);
    if (version !== undefined && version !== r.version) {
      await updateVersioned(transaction, by, r, version, {}, { projectId: project.id, objectType: "reaction", summary: "" });
    }
    const changes: Partial<Reaction["_attributes"]> = {};
    if (data.equation !== undefined) {
      const { text, terms } = await resolveEquation(project.id, data.equation, transaction);
      changes.equation = text;
      await writeTerms(transaction, r.id, terms);
    }
    if (data.transitionState !== undefined) {
      changes.transitionStateId = data.transitionState === null ? null : (await resolveSpecies(project.id, data.transitionState as Ref, transaction, "transitionState")).id;
    }
    if (data.protocol !== undefined) {
      changes.protocolId = data.protocol === null ? null : (await resolveProtocol(project.id, data.protocol as Ref, transaction, "protocol")).id;
    }
    if (data.notes !== undefined) changes.notes = data.notes;
    const updated = await updateVersioned(transaction, by, r, version, changes, {
      projectId: project.id,
      objectType: "reaction",
      summary: `Changed reaction ${changes.equation ?? r.equation}`,
    });
    return describeReaction(updated, await extrasOf(updated, transaction));
  });
}

export async function deleteReaction(project: Project, by: Principal, reactionId: number, version?: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const r = await findReaction(project.id, reactionId, transaction);
    await assertVersion(transaction, r, version, "reaction", undefined, "decide again");
    const old = { ...snapshotOf(r), ...(await extrasOf(r, transaction)) };
    await models.ReactionTerm.destroy({ where: { reactionId: r.id }, transaction });
    await r.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "delete",
      objectType: "reaction",
      objectId: r.id,
      summary: `Deleted reaction ${r.equation}`,
      oldValues: old,
    });
  });
}

/** Labels for the equation input's completion, the TS select and the protocol select. */
export async function reactionFormChoices(projectId: number) {
  const { Species, Protocol } = db().models;
  const [species, protocols] = await Promise.all([
    Species.findAll({ where: { projectId }, attributes: ["id", "label", "kind"], order: [["label", "ASC"]] }),
    Protocol.findAll({ where: { projectId }, attributes: ["id", "name"], order: [["id", "ASC"]] }),
  ]);
  return {
    species: species.map((s) => ({ id: s.id, label: s.label, kind: s.kind })),
    protocols: protocols.map((p) => ({ id: p.id, name: p.name })),
  };
}

/** What the reactions page needs on first paint: the computed ledger and the form's choices. */
export async function reactionLedgerPage(projectId: number, options: { protocol?: string | null; unit?: string | null }) {
  const [ledger, choices] = await Promise.all([computeReactions(projectId, options), reactionFormChoices(projectId)]);
  return { ledger, choices };
}
