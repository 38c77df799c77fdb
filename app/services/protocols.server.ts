import { type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Level, Protocol } from "../../db/models/ledger";
import { formatCompositeLevel, parseLevel } from "../domain/thermo";
import { ServiceError } from "../utils/http.server";
import { CONFORMER_TREATMENTS, LOW_FREQUENCY_TREATMENTS, STANDARD_STATES, THERMAL_SOURCES } from "../utils/ledger-vocab";
import { recordChange, snapshotOf, type Principal } from "./history.server";
import { optionalNumber, refSchema, versionSchema } from "./ledger-input.server";
import { levelName, levelParts } from "./levels.server";
import { resolveLevel, resolveProtocol, type Ref } from "./refs.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

export { CONFORMER_TREATMENTS, LOW_FREQUENCY_TREATMENTS, STANDARD_STATES, THERMAL_SOURCES };

const blank = (v: unknown) => (v === "" ? undefined : v);
const protocolFields = {
  name: z.string({ message: "Give the protocol a name" }).trim().min(1, "Give the protocol a name").max(120, "At most 120 characters"),
  energyLevel: refSchema("energyLevel"),
  thermalLevel: z.preprocess((v) => (v === "" ? null : v), refSchema("thermalLevel").nullable().optional()),
  thermalSource: z.preprocess(blank, z.enum(THERMAL_SOURCES, { message: "thermalSource is computed or stored" }).optional()),
  temperature: optionalNumber("temperature", { positive: true, max: 5000 }),
  standardState: z.preprocess(blank, z.enum(STANDARD_STATES, { message: 'standardState is "1 atm", "1 bar" or "1 M"' }).optional()),
  lowFrequency: z
    .object({
      treatment: z.enum(LOW_FREQUENCY_TREATMENTS, { message: "lowFrequency.treatment is none, grimme or truhlar" }),
      cutoff: optionalNumber("lowFrequency.cutoff", { positive: true, max: 1000 }),
    })
    .optional(),
  frequencyScale: optionalNumber("frequencyScale", { min: 0.5, max: 1.5 }),
  conformerTreatment: z.preprocess(blank, z.enum(CONFORMER_TREATMENTS, { message: "conformerTreatment is lowest or boltzmann" }).optional()),
};
export const protocolInputSchema = z.object(protocolFields);
export const protocolUpdateSchema = z.object({
  ...protocolFields,
  name: protocolFields.name.optional(),
  energyLevel: refSchema("energyLevel").optional(),
  version: versionSchema,
});
export type ProtocolInput = z.input<typeof protocolInputSchema>;
export type ProtocolUpdate = z.input<typeof protocolUpdateSchema>;

/** `energy level // geometry level`; a single level when both are the same. */
export function protocolNotation(energy: Level, thermal: Level | null): string {
  try {
    const e = parseLevel(levelParts(energy));
    const g = thermal && thermal.id !== energy.id ? parseLevel(levelParts(thermal)) : null;
    return formatCompositeLevel({ energy: e, geometry: g });
  } catch {
    return thermal && thermal.id !== energy.id ? `${levelName(energy)} // ${levelName(thermal)}` : levelName(energy);
  }
}

export function describeProtocol(p: Protocol, levels: Map<number, Level>, defaultProtocolId: number | null) {
  const energy = levels.get(p.energyLevelId) ?? null;
  const thermal = p.thermalLevelId ? (levels.get(p.thermalLevelId) ?? null) : energy;
  const lf = p.lowFrequencyTreatment;
  return {
    id: p.id,
    name: p.name,
    energyLevel: energy ? { id: energy.id, key: energy.key, name: levelName(energy) } : { id: p.energyLevelId, key: null, name: null },
    thermalLevel: thermal ? { id: thermal.id, key: thermal.key, name: levelName(thermal) } : null,
    /** whether the thermal level was given (null in the store = the energy level) */
    thermalLevelGiven: p.thermalLevelId !== null && p.thermalLevelId !== undefined,
    notation: energy ? protocolNotation(energy, thermal) : "",
    thermalSource: p.thermalSource,
    /** K */
    temperature: Number(p.temperatureK),
    standardState: p.standardState,
    lowFrequency: { treatment: lf, cutoff: Number(p.lowFrequencyCutoffCm1) },
    frequencyScale: Number(p.frequencyScale),
    conformerTreatment: p.conformerTreatment,
    isDefault: p.id === defaultProtocolId,
    version: p.version,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}
export type ProtocolView = ReturnType<typeof describeProtocol>;

/** A short line of the settings, e.g. "298.15 K · 1 M · quasi-RRHO (Grimme) 100 cm⁻¹ · scale 1 · lowest conformer". */
export function protocolSettingsLine(p: ProtocolView): string {
  const lf = p.lowFrequency.treatment === "none" ? "RRHO" : `${p.lowFrequency.treatment === "grimme" ? "quasi-RRHO (Grimme)" : "raised to cutoff (Truhlar)"} ${p.lowFrequency.cutoff} cm⁻¹`;
  return `${p.temperature} K · ${p.standardState} · ${lf} · scale ${p.frequencyScale} · ${p.conformerTreatment === "lowest" ? "lowest conformer" : "Boltzmann ensemble"} · thermal ${p.thermalSource}`;
}

async function levelMap(projectId: number, tx?: Transaction) {
  const levels = await db().models.Level.findAll({ where: { projectId }, transaction: tx });
  return new Map(levels.map((l) => [l.id, l]));
}

async function defaultIdOf(projectId: number, tx?: Transaction) {
  const p = await db().models.Project.findByPk(projectId, { attributes: ["id", "defaultProtocolId"], transaction: tx });
  return p?.defaultProtocolId ?? null;
}

export async function listProtocols(projectId: number) {
  const [rows, levels, defaultId] = await Promise.all([
    db().models.Protocol.findAll({ where: { projectId }, order: [["id", "ASC"]] }),
    levelMap(projectId),
    defaultIdOf(projectId),
  ]);
  return rows.map((p) => describeProtocol(p, levels, defaultId));
}

export async function getProtocol(projectId: number, ref: Ref) {
  const p = await resolveProtocol(projectId, ref, undefined, "protocolId");
  return describeProtocol(p, await levelMap(projectId), await defaultIdOf(projectId));
}

/** The project's default protocol (reads without ?protocol= use it), or null when it has none. */
export async function defaultProtocol(projectId: number) {
  const id = await defaultIdOf(projectId);
  return id ? getProtocol(projectId, id) : null;
}

async function columnsOf(projectId: number, data: z.output<typeof protocolUpdateSchema>, tx: Transaction) {
  const cols: Partial<Protocol["_attributes"]> = {};
  if (data.name !== undefined) cols.name = data.name;
  if (data.energyLevel !== undefined) cols.energyLevelId = (await resolveLevel(projectId, data.energyLevel, tx, "energyLevel")).id;
  if (data.thermalLevel !== undefined) cols.thermalLevelId = data.thermalLevel === null ? null : (await resolveLevel(projectId, data.thermalLevel, tx, "thermalLevel")).id;
  if (data.thermalSource !== undefined) cols.thermalSource = data.thermalSource;
  if (data.temperature !== undefined) cols.temperatureK = String(data.temperature);
  if (data.standardState !== undefined) cols.standardState = data.standardState;
  if (data.lowFrequency !== undefined) {
    cols.lowFrequencyTreatment = data.lowFrequency.treatment;
    if (data.lowFrequency.cutoff !== undefined) cols.lowFrequencyCutoffCm1 = String(data.lowFrequency.cutoff);
  }
  if (data.frequencyScale !== undefined) cols.frequencyScale = String(data.frequencyScale);
  if (data.conformerTreatment !== undefined) cols.conformerTreatment = data.conformerTreatment;
  return cols;
}

async function assertNameFree(projectId: number, name: string, exceptId: number | null, tx: Transaction) {
  const clash = await db().models.Protocol.findOne({ where: { projectId, name }, transaction: tx });
  if (clash && clash.id !== exceptId) throw new ServiceError(409, "duplicate_name", `A protocol named ${name} already exists`, [{ field: "name", message: `${name} is already used` }]);
}

/** Creates a protocol; the project's first protocol becomes its default. */
export async function createProtocol(project: Project, by: Principal, input: ProtocolInput) {
  const data = protocolInputSchema.parse(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    await assertNameFree(project.id, data.name, null, transaction);
    const cols = await columnsOf(project.id, data, transaction);
    const p = await models.Protocol.create({ projectId: project.id, ...(cols as { name: string; energyLevelId: number }) }, { transaction });
    await recordChange(transaction, by, { projectId: project.id, action: "create", objectType: "protocol", objectId: p.id, summary: `Added protocol ${p.name}`, newValues: snapshotOf(p) });
    const fresh = await models.Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
    let defaultId = fresh?.defaultProtocolId ?? null;
    if (fresh && !defaultId) {
      await fresh.update({ defaultProtocolId: p.id }, { transaction });
      defaultId = p.id;
      await recordChange(transaction, by, { projectId: project.id, action: "update", objectType: "project", objectId: project.id, summary: `Default protocol: ${p.name} (the first one)`, oldValues: { defaultProtocolId: null }, newValues: { defaultProtocolId: p.id } });
    }
    return describeProtocol(p, await levelMap(project.id, transaction), defaultId);
  });
}

export async function updateProtocol(project: Project, by: Principal, ref: Ref, input: ProtocolUpdate) {
  const data = protocolUpdateSchema.parse(input);
  const version = expectedVersionOf(data);
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const p = await resolveProtocol(project.id, ref, transaction, "protocolId");
    if (data.name !== undefined) await assertNameFree(project.id, data.name, p.id, transaction);
    if (version !== undefined && version !== p.version) await updateVersioned(transaction, by, p, version, {}, { projectId: project.id, objectType: "protocol", summary: "" });
    const cols = await columnsOf(project.id, data, transaction);
    const updated = await updateVersioned(transaction, by, p, version, cols, { projectId: project.id, objectType: "protocol", summary: `Changed protocol ${p.name}` });
    return describeProtocol(updated, await levelMap(project.id, transaction), await defaultIdOf(project.id, transaction));
  });
}

/** Makes a protocol the project's default (owners and editors; the route checks "edit"). */
export async function setDefaultProtocol(project: Project, by: Principal, ref: Ref) {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const p = await resolveProtocol(project.id, ref, transaction, "protocol");
    const fresh = (await models.Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const old = fresh.defaultProtocolId ?? null;
    if (old !== p.id) {
      await fresh.update({ defaultProtocolId: p.id }, { transaction });
      await recordChange(transaction, by, { projectId: project.id, action: "update", objectType: "project", objectId: project.id, summary: `Default protocol: ${p.name}`, oldValues: { defaultProtocolId: old }, newValues: { defaultProtocolId: p.id } });
    }
    return describeProtocol(p, await levelMap(project.id, transaction), p.id);
  });
}

/**
 * Deletes a protocol; reactions and pathways that named it fall back to the default; a deleted default
 * passes to the oldest remaining protocol. With `version`, only if it is still the one the caller saw.
 */
export async function deleteProtocol(project: Project, by: Principal, ref: Ref, version?: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const p = await resolveProtocol(project.id, ref, transaction, "protocolId");
    await assertVersion(transaction, p, version, "protocol", undefined, "decide again");
    const old = snapshotOf(p);
    await p.destroy({ transaction });
    await recordChange(transaction, by, { projectId: project.id, action: "delete", objectType: "protocol", objectId: p.id, summary: `Deleted protocol ${p.name}`, oldValues: old });
    const fresh = await models.Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (fresh && fresh.defaultProtocolId === p.id) {
      const next = await models.Protocol.findOne({ where: { projectId: project.id }, order: [["id", "ASC"]], transaction });
      await fresh.update({ defaultProtocolId: next?.id ?? null }, { transaction });
      await recordChange(transaction, by, { projectId: project.id, action: "update", objectType: "project", objectId: project.id, summary: `Default protocol: ${next ? next.name : "none"} (the default was deleted)`, oldValues: { defaultProtocolId: p.id }, newValues: { defaultProtocolId: next?.id ?? null } });
    }
  });
}

