import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import { db } from "../../db";
import type { Project } from "../../db/models/foundation";
import type { Level } from "../../db/models/ledger";
import {
  canonicalLevelKey, classifyBasis, classifyMethod, formatLevel, methodCarriesBasis, parseLevel, parseLevelString, type Level as ParsedLevel,
} from "../domain/thermo";
import { ServiceError } from "../utils/http.server";
import { recordChange, snapshotOf, type Principal } from "./history.server";
import { fromThermo, resolveLevel, type Ref } from "./refs.server";
import { assertVersion, expectedVersionOf, updateVersioned } from "./versioned.server";

const text = (max: number) => z.string().trim().max(max, `At most ${max} characters`);

/**
 * A level as parts ({method, basis, dispersion?, solvation?}) or as one line of text
 * (`B3LYP-D3(BJ)/def2-SVP SMD(toluene)`): the API sends parts, the page's form may send either.
 */
export const levelInputSchema = z
  .object({
    text: text(300).optional(),
    method: text(120).optional(),
    basis: text(120).optional(),
    dispersion: text(40).nullish(),
    solvation: z.object({ model: text(40).min(1, "Name the solvation model"), solvent: text(80).min(1, "Name the solvent") }).nullish(),
  })
  .refine((v) => !!v.text || (!!v.method && (!!v.basis || methodCarriesBasis(v.method))), {
    message: "Give the method and the basis set (or the whole level as text, e.g. B3LYP-D3(BJ)/def2-SVP)",
    path: ["method"],
  });
export type LevelInput = z.input<typeof levelInputSchema>;
export const levelUpdateSchema = z.intersection(levelInputSchema, z.object({ version: z.coerce.number().int().positive().optional() }));

/** Parses the input with the engine; bad parts come back as 422 on the field the engine names. */
export function parseLevelInput(input: LevelInput): { parsed: ParsedLevel; key: string } {
  const data = levelInputSchema.parse(input);
  const parsed = data.text && !data.method
    ? fromThermo("text", () => parseLevelString(data.text!))
    : fromThermo("level", () =>
        parseLevel({ method: data.method!, basis: data.basis ?? "", dispersion: data.dispersion ?? null, solvation: data.solvation ?? null }),
      );
  return { parsed, key: canonicalLevelKey(parsed) };
}

const partsOf = (parsed: ParsedLevel, key: string) => ({
  key,
  method: parsed.method,
  basis: parsed.basis,
  dispersion: parsed.dispersion,
  solvationModel: parsed.solvation?.model ?? null,
  solvent: parsed.solvation?.solvent ?? null,
});

/** The stored level as the engine's input (display parts). */
export function levelParts(l: Level) {
  return {
    method: l.method,
    basis: l.basis,
    dispersion: l.dispersion ?? null,
    solvation: l.solvationModel && l.solvent ? { model: l.solvationModel, solvent: l.solvent } : null,
  };
}

/** The human form, e.g. "B3LYP-D3(BJ)/def2-SVP (SMD, toluene)". */
export function levelName(l: Level): string {
  try {
    return formatLevel(levelParts(l));
  } catch {
    return l.key;
  }
}

export function describeLevel(l: Level) {
  const safe = <T,>(fn: () => T): T | null => {
    try {
      return fn();
    } catch {
      return null;
    }
  };
  return {
    id: l.id,
    key: l.key,
    name: levelName(l),
    method: l.method,
    basis: l.basis,
    dispersion: l.dispersion ?? null,
    solvation: levelParts(l).solvation,
    classification: { method: safe(() => classifyMethod(l.method)), basis: safe(() => classifyBasis(l.basis)) },
    version: l.version,
    createdAt: l.createdAt.toISOString(),
    updatedAt: l.updatedAt.toISOString(),
  };
}
export type LevelView = ReturnType<typeof describeLevel>;

export async function listLevels(projectId: number, tx?: Transaction) {
  const rows = await db().models.Level.findAll({ where: { projectId }, order: [["id", "ASC"]], transaction: tx });
  return rows.map(describeLevel);
}

export async function getLevel(projectId: number, ref: Ref) {
  return describeLevel(await resolveLevel(projectId, ref, undefined, "levelId"));
}

/**
 * Creates a level, or returns the existing one when the input is an alias of it (same canonical key):
 * `created` says which, so the API answers 201 or 200 and the page says "same as existing level …".
 */
export async function createLevel(project: Project, by: Principal, input: LevelInput): Promise<{ level: LevelView; created: boolean }> {
  const { parsed, key } = parseLevelInput(input);
  const { sequelize, models } = db();
  const existing = await models.Level.findOne({ where: { projectId: project.id, key } });
  if (existing) return { level: describeLevel(existing), created: false };
  try {
    return await sequelize.transaction(async (transaction) => {
      const level = await models.Level.create({ projectId: project.id, ...partsOf(parsed, key) }, { transaction });
      await recordChange(transaction, by, {
        projectId: project.id,
        action: "create",
        objectType: "level",
        objectId: level.id,
        summary: `Added level ${levelName(level)}`,
        newValues: snapshotOf(level),
      });
      return { level: describeLevel(level), created: true };
    });
  } catch (error) {
    // Two requests adding the same level at once: the second finds the first.
    if (error instanceof UniqueConstraintError) {
      const again = await models.Level.findOne({ where: { projectId: project.id, key } });
      if (again) return { level: describeLevel(again), created: false };
    }
    throw error;
  }
}

export async function updateLevel(project: Project, by: Principal, ref: Ref, input: LevelInput & { version?: unknown }) {
  const version = expectedVersionOf(input);
  const { parsed, key } = parseLevelInput(input);
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const level = await resolveLevel(project.id, ref, transaction, "levelId");
    const clash = await models.Level.findOne({ where: { projectId: project.id, key }, transaction });
    if (clash && clash.id !== level.id) {
      throw new ServiceError(409, "duplicate_level", `This is the same as existing level ${levelName(clash)} (#${clash.id})`, [
        { field: "method", message: `Same as existing level ${levelName(clash)}` },
      ]);
    }
    const updated = await updateVersioned(transaction, by, level, version, partsOf(parsed, key), {
      projectId: project.id,
      objectType: "level",
      summary: `Changed level ${levelName(level)} to ${formatLevel(parsed)}`,
    });
    return describeLevel(updated);
  });
}

/**
 * Deletes a level no calculation or protocol uses (those would lose their meaning); with `version`, only
 * if it is still the one the caller saw (else 409 with the current values).
 */
export async function deleteLevel(project: Project, by: Principal, ref: Ref, version?: number) {
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    const level = await resolveLevel(project.id, ref, transaction, "levelId");
    await assertVersion(transaction, level, version, "level", undefined, "decide again");
    const [calcs, protocols] = await Promise.all([
      models.Calculation.count({ where: { levelId: level.id }, transaction }),
      models.Protocol.count({ where: { projectId: project.id, [Op.or]: [{ energyLevelId: level.id }, { thermalLevelId: level.id }] }, transaction }),
    ]);
    if (calcs || protocols) {
      throw new ServiceError(409, "level_in_use", `Level ${levelName(level)} is used by ${calcs} calculation(s) and ${protocols} protocol(s); remove those first`);
    }
    await level.destroy({ transaction });
    await recordChange(transaction, by, {
      projectId: project.id,
      action: "delete",
      objectType: "level",
      objectId: level.id,
      summary: `Deleted level ${levelName(level)}`,
      oldValues: snapshotOf(level),
    });
  });
}
