import { z } from "zod";
import type { Limits } from "../engine/limits";
import type { Netlist } from "../engine/netlist";
import { limitsSchema } from "../schemas/limits";
import { portSchema } from "../schemas/netlist";
import { intervalSchema, isoInstant, personRefSchema, shaped } from "./common";
import { DISTRIBUTIONS, PART_KINDS, REVIEW_STATES, STRESS_CLASSES } from "./vocabulary";

/** Responses of the design, revision, limit-set, grade and measured-response routes. */

/**
 * A stored netlist as the API sends it back. Looser than the request's netlistSchema (a stored part may carry model
 * fields the form does not edit), but every part has its ref, kind, nodes and value.
 */
export const storedNetlistSchema = shaped<Netlist>(
  z.object({
    name: z.string().optional(),
    ports: z.array(portSchema),
    parts: z.array(z.looseObject({ ref: z.string(), kind: z.enum(PART_KINDS), nodes: z.tuple([z.string(), z.string()]), value: z.number() })),
  }),
);

export const storedLimitsSchema = shaped<Limits>(limitsSchema);

/** Default sweep of a revision's nominal plot (Hz). */
export const sweepSettingSchema = z.strictObject({ from: z.number(), to: z.number(), points: z.number().int(), scale: z.enum(["log", "lin"]) });
export type SweepSetting = z.infer<typeof sweepSettingSchema>;
export const DEFAULT_SWEEP: SweepSetting = { from: 1e6, to: 1e9, points: 201, scale: "log" };

export const designViewSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  stress: z.enum(STRESS_CLASSES),
  owner: personRefSchema,
  /** newest revision, as the designs table shows it */
  latestRevision: z.strictObject({ id: z.string(), number: z.number().int(), reviewState: z.enum(REVIEW_STATES) }).nullable(),
  /** newest finished run: yield and its Wilson 95 % interval */
  latestYield: z.strictObject({ runId: z.string(), yield: z.number(), wilson95: intervalSchema }).nullable(),
  createdAt: isoInstant,
  updatedAt: isoInstant,
  archivedAt: isoInstant.nullable(),
});
export type DesignView = z.infer<typeof designViewSchema>;

/** A revision without its netlist (the design page's revision list). */
export const revisionSummarySchema = z.strictObject({
  id: z.string(),
  number: z.number().int(),
  note: z.string(),
  reviewState: z.enum(REVIEW_STATES),
  locked: z.boolean(),
  parentId: z.string().nullable(),
  createdAt: isoInstant,
  createdBy: personRefSchema,
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** A whole revision, netlist and sweep included. */
export const revisionSchema = revisionSummarySchema.extend({ designId: z.string(), netlist: storedNetlistSchema, sweep: sweepSettingSchema });
export type Revision = z.infer<typeof revisionSchema>;

export const limitSetSummarySchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  lotSize: z.number().int(),
  ruleCount: z.number().int(),
  updatedAt: isoInstant,
});
export type LimitSetSummary = z.infer<typeof limitSetSummarySchema>;

export const limitSetSchema = z.strictObject({
  id: z.string(),
  designId: z.string(),
  name: z.string(),
  limits: storedLimitsSchema,
  lotSize: z.number().int(),
  updatedAt: isoInstant,
});
export type LimitSet = z.infer<typeof limitSetSchema>;

/** A purchasable tolerance grade of one part kind and its cost each (currency of the team's choice). */
export const gradeSchema = z.strictObject({
  id: z.string(),
  kind: z.enum(PART_KINDS),
  code: z.string(),
  label: z.string(),
  tolerance: z.number().nullable(),
  toleranceAbs: z.number().nullable(),
  distribution: z.enum(DISTRIBUTIONS),
  costEach: z.number(),
});
export type Grade = z.infer<typeof gradeSchema>;

export const measuredSummarySchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  fileName: z.string(),
  points: z.number().int(),
  createdAt: isoInstant,
});
export type MeasuredSummary = z.infer<typeof measuredSummarySchema>;

/** A measured response with |S_ij| in dB per pair; s12/s21/s22 exist for two-port files only. */
export const measuredSchema = z.strictObject({
  id: z.string(),
  designId: z.string(),
  name: z.string(),
  fileName: z.string(),
  createdAt: isoInstant,
  data: z.strictObject({
    freqs: z.array(z.number()),
    ports: z.number().int(),
    z0: z.array(z.number()),
    sDb: z.strictObject({
      s11: z.array(z.number()),
      s21: z.array(z.number()).optional(),
      s12: z.array(z.number()).optional(),
      s22: z.array(z.number()).optional(),
    }),
  }),
});
export type Measured = z.infer<typeof measuredSchema>;

export const designDetailSchema = z.strictObject({
  design: designViewSchema,
  revisions: z.array(revisionSummarySchema),
  limitSets: z.array(limitSetSummarySchema),
  measured: z.array(measuredSummarySchema),
});
export type DesignDetail = z.infer<typeof designDetailSchema>;

export const designsResponseSchema = z.strictObject({ designs: z.array(designViewSchema) });
export const designResponseSchema = z.strictObject({ design: designViewSchema });
export const createdDesignResponseSchema = z.strictObject({ design: designViewSchema, revision: revisionSchema });
export const revisionResponseSchema = z.strictObject({ revision: revisionSchema });
/** POST /designs/:id/measured answers the new response's summary without its date. */
export const uploadedMeasuredResponseSchema = z.strictObject({ measured: measuredSummarySchema.omit({ createdAt: true }) });
export const measuredResponseSchema = z.strictObject({ measured: measuredSchema });
export const limitSetsResponseSchema = z.strictObject({ limitSets: z.array(limitSetSchema) });
export const limitSetResponseSchema = z.strictObject({ limitSet: limitSetSchema });
export const gradesResponseSchema = z.strictObject({ grades: z.array(gradeSchema) });
export const gradeResponseSchema = z.strictObject({ grade: gradeSchema });
