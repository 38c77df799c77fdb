import { z } from "zod";

/**
 * Input pieces shared by the ledger's schemas. Forms send text, the API sends JSON: an empty form field
 * means "not given", and numbers may come as numbers or numeric strings.
 */
const blankToUndefined = (v: unknown) => (v === "" || v === null ? undefined : v);
const blankToNull = (v: unknown) => (v === "" ? null : v);

export const optionalInt = (field: string, min: number, max: number) =>
  z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ message: `${field} must be a whole number` })
      .int(`${field} must be a whole number`)
      .min(min, `${field} must be at least ${min}`)
      .max(max, `${field} must be at most ${max}`)
      .optional(),
  );

export const optionalNumber = (field: string, opts: { min?: number; max?: number; positive?: boolean } = {}) => {
  let n = z.coerce.number({ message: `${field} must be a number` }).refine(Number.isFinite, `${field} must be a finite number`);
  if (opts.positive) n = n.refine((v) => v > 0, `${field} must be greater than 0`);
  if (opts.min !== undefined) n = n.refine((v) => v >= opts.min!, `${field} must be at least ${opts.min}`);
  if (opts.max !== undefined) n = n.refine((v) => v <= opts.max!, `${field} must be at most ${opts.max}`);
  return z.preprocess(blankToUndefined, n.optional());
};

/** Text that may be cleared: "" and null mean "none". */
export const nullableText = (max: number) => z.preprocess(blankToNull, z.string().trim().max(max, `At most ${max} characters`).nullable().optional());

export const refSchema = (field: string) =>
  z.union([z.number().int().positive(), z.string().trim().min(1, `Name the ${field}`).max(300)], { message: `${field} must be an id or a name` });

export const versionSchema = z.preprocess(blankToUndefined, z.coerce.number().int().positive("version must be a positive whole number").optional());

/** Form checkboxes send "on"/"true"; JSON sends booleans. */
export const optionalBool = z.preprocess((v) => {
  if (v === "" || v === null || v === undefined) return undefined;
  if (typeof v === "string") return ["on", "true", "1", "yes"].includes(v.toLowerCase());
  return v;
}, z.boolean({ message: "must be true or false" }).optional());
