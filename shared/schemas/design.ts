import { z } from "zod";
import { limitsSchema } from "./limits";
import { netlistSchema } from "./netlist";
import { sweepSchema } from "./run";
import { DISTRIBUTIONS, MAX_GRADE_CODE_LENGTH, PART_KINDS, STRESS_CLASSES } from "../contracts/vocabulary";

/**
 * JSON shapes of the design, revision, limit-set and grade requests (server routes and client forms share them).
 * Structure and ranges only: the netlist's semantic checks (compileNetlist) and the limits' port check
 * (validateLimits against the latest revision) run on the server after these.
 */

/** How the filter is used (STRESS_CLASSES of shared/contracts/vocabulary.ts). */
export const stressSchema = z.enum(STRESS_CLASSES, { message: `must be ${STRESS_CLASSES.map((s) => `"${s}"`).join(", ").replace(/, ([^,]*)$/, " or $1")}` });

const designName = z.string().trim().min(1, { message: "name is required" }).max(120, { message: "name is at most 120 characters" });
const description = z.string().max(2000, { message: "description is at most 2000 characters" });
const note = z.string().max(500, { message: "note is at most 500 characters" });
const uuid = z.string().uuid({ message: "must be an id" });

export const createDesignSchema = z.strictObject({
  name: designName,
  description: description.optional(),
  stress: stressSchema.optional(),
  netlist: netlistSchema,
  sweep: sweepSchema.optional(),
});

export const updateDesignSchema = z.strictObject({
  name: designName.optional(),
  description: description.optional(),
  stress: stressSchema.optional(),
  archived: z.boolean({ message: "archived must be true or false" }).optional(),
});

/** POST /designs/:id/revisions (parentId allowed) and PUT /revisions/:id (parentId ignored there). */
export const revisionBodySchema = z.strictObject({
  netlist: netlistSchema,
  sweep: sweepSchema.optional(),
  note: note.optional(),
  parentId: uuid.optional(),
});

/** PUT /revisions/:id: the same body, parentId not taken (the revision keeps its parent). */
export const replaceRevisionSchema = revisionBodySchema.omit({ parentId: true });

/** Text fields sent with a multipart revision upload. */
export const revisionUploadFieldsSchema = z.object({ note: note.optional() });

/** Text fields sent with a multipart measured-response upload; name defaults to the file name. */
export const measuredUploadFieldsSchema = z.object({
  name: z.string().trim().min(1, { message: "name is required" }).max(120, { message: "name is at most 120 characters" }).optional(),
});

export const limitSetBodySchema = z.strictObject({
  name: z.string().trim().min(1, { message: "name is required" }).max(120, { message: "name is at most 120 characters" }),
  limits: limitsSchema,
  lotSize: z.number({ message: "lotSize must be a number" }).int({ message: "lotSize must be a whole number" }).min(1, { message: "lotSize must be ≥ 1" }).max(100_000_000, { message: "lotSize must be ≤ 100000000" }),
});

export const gradeBodySchema = z
  .strictObject({
    kind: z.enum(PART_KINDS, { message: "kind must be R, L or C" }),
    code: z.string().trim().min(1, { message: "code is required" }).max(MAX_GRADE_CODE_LENGTH, { message: `code is at most ${MAX_GRADE_CODE_LENGTH} characters` }),
    label: z.string().trim().min(1, { message: "label is required" }).max(120, { message: "label is at most 120 characters" }),
    tolerance: z.number({ message: "tolerance must be a number" }).min(0, { message: "tolerance must be ≥ 0" }).max(0.5, { message: "tolerance must be ≤ 0.5" }).optional(),
    toleranceAbs: z.number({ message: "toleranceAbs must be a number" }).positive({ message: "toleranceAbs must be > 0" }).finite().optional(),
    distribution: z.enum(DISTRIBUTIONS, { message: "distribution must be normal or uniform" }).optional(),
    costEach: z.number({ message: "costEach must be a number" }).min(0, { message: "costEach must be ≥ 0" }).max(1_000_000, { message: "costEach must be ≤ 1000000" }),
  })
  .refine((g) => g.tolerance !== undefined || g.toleranceAbs !== undefined, { message: "needs tolerance and/or toleranceAbs", path: ["tolerance"] });

export const listDesignsQuerySchema = z.object({
  archived: z.enum(["true", "false"], { message: "archived must be true or false" }).optional(),
});

export type CreateDesignInput = z.infer<typeof createDesignSchema>;
export type UpdateDesignInput = z.infer<typeof updateDesignSchema>;
export type RevisionBodyInput = z.infer<typeof revisionBodySchema>;
export type LimitSetBodyInput = z.infer<typeof limitSetBodySchema>;
export type GradeBodyInput = z.infer<typeof gradeBodySchema>;
