import { z } from "zod";
import { E_SERIES_NAMES } from "../engine/netlist";
import { DISTRIBUTIONS, MAX_GRADE_CODE_LENGTH, PART_KINDS } from "../contracts/vocabulary";

/**
 * JSON shape of a Lotwise netlist (structure and ranges only), for the API, CLI and upload edges.
 * Semantic checks (duplicate refs, floating nodes, port nodes that no part touches...) happen in
 * `compileNetlist` (shared/engine/solver.ts), which names the part in an EngineError.
 * Parts and ports are strict objects: a misspelt field such as "tolerence" is an error, not a
 * silently exact part.
 */

const MAX_PARTS = 500;

const positive = (what: string) => z.number({ message: `${what} must be a number` }).positive({ message: `${what} must be > 0` });
const nonNegative = (what: string) =>
  z.number({ message: `${what} must be a number` }).nonnegative({ message: `${what} must be ≥ 0` });

const nodeNameSchema = z.string().min(1, { message: "node name is required" }).max(64, { message: "node name is at most 64 characters" });

export const eSeriesNameSchema = z.enum(E_SERIES_NAMES);

export const portSchema = z.strictObject({
  name: z.string().min(1, { message: "port name is required" }).max(64, { message: "port name is at most 64 characters" }),
  node: nodeNameSchema,
  z0: positive("z0"),
});

export const partSchema = z.strictObject({
  ref: z
    .string()
    .min(1, { message: "ref is required" })
    .max(32, { message: "ref is at most 32 characters" })
    .regex(/^[A-Za-z0-9_.-]+$/, { message: "ref may use only letters, digits, _ . -" }),
  kind: z.enum(PART_KINDS),
  nodes: z.tuple([nodeNameSchema, nodeNameSchema]),
  value: positive("value"),
  tolerance: z.number().min(0, { message: "tolerance must be ≥ 0" }).max(0.5, { message: "tolerance must be ≤ 0.5" }).optional(),
  distribution: z.enum(DISTRIBUTIONS).optional(),
  toleranceAbs: nonNegative("toleranceAbs").optional(),
  series: eSeriesNameSchema.optional(),
  lot: z.string().max(32, { message: "lot is at most 32 characters" }).optional(),
  q: z.strictObject({ value: positive("q.value"), at: positive("q.at") }).optional(),
  srf: positive("srf").optional(),
  esr: nonNegative("esr").optional(),
  esl: nonNegative("esl").optional(),
  tempco: z.number({ message: "tempco must be a number" }).optional(),
  grade: z.string().min(1).max(MAX_GRADE_CODE_LENGTH, { message: `grade is at most ${MAX_GRADE_CODE_LENGTH} characters` }).optional(),
});

export const netlistSchema = z.object({
  name: z.string().max(120, { message: "name is at most 120 characters" }).optional(),
  ports: z.array(portSchema).min(2, { message: "needs at least 2 ports" }),
  parts: z.array(partSchema).min(1, { message: "needs at least 1 part" }).max(MAX_PARTS, { message: `at most ${MAX_PARTS} parts` }),
});

export type NetlistInput = z.infer<typeof netlistSchema>;
export type PortInput = z.infer<typeof portSchema>;
export type PartInput = z.infer<typeof partSchema>;
