import { z } from "zod";
import { ROLES } from "../roles";

/** An instant as the API sends it: `Date.toISOString()`. */
export const isoInstant = z.iso.datetime();

export const idSchema = z.string().min(1);

/** A person beside a record (launcher, author, owner): id and display name. */
export const personRefSchema = z.strictObject({ id: z.string(), name: z.string() });
export type PersonRef = z.infer<typeof personRefSchema>;

export const roleSchema = z.enum(ROLES);

/** A [low, high] interval (Wilson 95 % and the like). */
export const intervalSchema = z.tuple([z.number(), z.number()]);

/**
 * A schema whose parsed value is typed as T, for values whose TypeScript type lives elsewhere (the engine's Netlist,
 * Limits and RunResult): the schema checks the shape at run time, T is what code sees.
 */
export function shaped<T>(schema: z.ZodType): z.ZodType<T> {
  return schema as unknown as z.ZodType<T>;
}

/** `{ ok: true }` of the mail-sending auth routes. */
export const okSchema = z.strictObject({ ok: z.literal(true) });
