import { Op, type Transaction } from "sequelize";
import { db } from "../../db";
import type { Level, Protocol, Species } from "../../db/models/ledger";
import { canonicalLevelKey, parseLevelString, ThermoInputError } from "../domain/thermo";
import { ServiceError, type ErrorDetail } from "../utils/http.server";

/**
 * References by id or by name. The API (and the reactions, pathways and import code) accept a species
 * by id or label, a level by id, canonical key or any alias the engine reads, a protocol by id or name:
 * these are the one place that turns such a reference into a row, or refuses it with 422 naming the field.
 */
export type Ref = number | string;

export function unknownRef(field: string, kind: string, ref: Ref, hint?: string): ServiceError {
  const message = `${kind} ${JSON.stringify(String(ref))} is not in this project${hint ? ` (${hint})` : ""}`;
  // A reference from the URL (speciesId, levelId, …) names a resource that is not there: 404, as for
  // reactions and calculations. A reference in the body is bad input: 422 naming the field.
  if (PATH_FIELDS.has(field)) return new ServiceError(404, "not_found", message, [{ field, message }]);
  return new ServiceError(422, "unknown_reference", message, [{ field, message }]);
}
const PATH_FIELDS = new Set(["speciesId", "levelId", "protocolId", "conformerId"]);

/** A 422 naming one field: the shape every ledger service uses for bad input. */
export function invalidField(field: string, message: string, extra: Partial<ErrorDetail> = {}): ServiceError {
  return new ServiceError(422, "invalid_input", message, [{ field, message, ...extra }]);
}

/** The engine rejects impossible input with ThermoInputError; services answer it as 422 on `field`. */
export function fromThermo<T>(field: string, fn: () => T): T {
  try {
    return fn();
  } catch (error) {
    if (error instanceof ThermoInputError) throw invalidField(field, error.message.replace(/\.$/, ""));
    throw error;
  }
}

const asId = (ref: Ref): number | null => {
  if (typeof ref === "number") return Number.isInteger(ref) && ref > 0 ? ref : null;
  return /^\d{1,10}$/.test(ref.trim()) ? Number(ref.trim()) : null;
};

function requireRef(ref: unknown, field: string): Ref {
  if ((typeof ref === "string" && ref.trim() !== "") || typeof ref === "number") return typeof ref === "string" ? ref.trim() : ref;
  throw invalidField(field, `${field} must be an id or a name`);
}

/**
 * A species by id (number) or label (string; labels compare exactly). A string of digits that is no
 * label is tried as an id, since compound labels such as "1" or "2a" are common.
 */
export async function resolveSpecies(projectId: number, ref: Ref, tx?: Transaction, field = "species"): Promise<Species> {
  const r = requireRef(ref, field);
  const { Species } = db().models;
  if (typeof r === "string") {
    const byLabel = await Species.findOne({ where: { projectId, label: r }, transaction: tx });
    if (byLabel) return byLabel;
  }
  const id = asId(r);
  const byId = id ? await Species.findOne({ where: { projectId, id }, transaction: tx }) : null;
  if (byId) return byId;
  throw unknownRef(field, "species", r);
}

/** The canonical key of a level written as text, or null when the text is not a level at all. */
export function levelKeyOf(text: string): string | null {
  try {
    return canonicalLevelKey(parseLevelString(text));
  } catch (error) {
    if (error instanceof ThermoInputError) return null;
    throw error;
  }
}

/** A level by id, canonical key, or any alias (`wB97X-D/def2TZVP` finds `ωB97X-D/def2-TZVP`). */
export async function resolveLevel(projectId: number, ref: Ref, tx?: Transaction, field = "level"): Promise<Level> {
  const r = requireRef(ref, field);
  const { Level } = db().models;
  const id = asId(r);
  if (id) {
    const byId = await Level.findOne({ where: { projectId, id }, transaction: tx });
    if (byId) return byId;
    if (typeof r === "number") throw unknownRef(field, "level", r);
  }
  const text = String(r);
  const key = levelKeyOf(text);
  const candidates = [text, ...(key && key !== text ? [key] : [])];
  const found = await Level.findOne({ where: { projectId, key: { [Op.in]: candidates } }, transaction: tx });
  if (found) return found;
  throw unknownRef(field, "level", r, key ? `canonical form ${key}` : "write it as method/basis, e.g. B3LYP-D3(BJ)/def2-SVP");
}

/** A protocol by id or name. */
export async function resolveProtocol(projectId: number, ref: Ref, tx?: Transaction, field = "protocol"): Promise<Protocol> {
  const r = requireRef(ref, field);
  const { Protocol } = db().models;
  if (typeof r === "string") {
    const byName = await Protocol.findOne({ where: { projectId, name: r }, transaction: tx });
    if (byName) return byName;
  }
  const id = asId(r);
  const byId = id ? await Protocol.findOne({ where: { projectId, id }, transaction: tx }) : null;
  if (byId) return byId;
  throw unknownRef(field, "protocol", r);
}
