import { z } from "zod";
import { MAX_GRADE_CODE_LENGTH } from "../contracts/vocabulary";
import { partRecord } from "./part-record";

/**
 * JSON shape of `POST /api/runs`: launch a Monte Carlo run of a stored revision against a stored
 * limit set. The engine options (sweep, corners...) are checked again by the engine when the run is
 * created (server/services/runs.ts), so a semantic error still comes back as a 400 naming the field.
 */

/** Most trials one API run may ask for (the engine allows more; the queue is shared by the team). */
export const MAX_API_TRIALS = 1_000_000;
/** Largest integer seed (2^31 − 1). */
export const MAX_API_SEED = 2_147_483_647;

const id = (what: string) => z.uuid({ message: `${what} must be an id` });
const partRef = z.string().min(1).max(32);

export const toleranceOverrideSchema = z
  .strictObject({
    tolerance: z.number().min(0, { message: "tolerance must be ≥ 0" }).max(0.5, { message: "tolerance must be ≤ 0.5" }).optional(),
    toleranceAbs: z.number().nonnegative({ message: "toleranceAbs must be ≥ 0" }).finite().optional(),
  })
  .refine((o) => o.tolerance !== undefined || o.toleranceAbs !== undefined, { message: "needs tolerance or toleranceAbs" });

export const createRunSchema = z.strictObject({
  revisionId: id("revisionId"),
  limitSetId: id("limitSetId"),
  trials: z
    .number({ message: "trials must be a number" })
    .int({ message: "trials must be an integer" })
    .min(1, { message: "trials must be ≥ 1" })
    .max(MAX_API_TRIALS, { message: `trials must be ≤ ${MAX_API_TRIALS}` }),
  seed: z
    .number({ message: "seed must be a number" })
    .int({ message: "seed must be an integer" })
    .min(0, { message: "seed must be ≥ 0" })
    .max(MAX_API_SEED, { message: `seed must be ≤ ${MAX_API_SEED}` })
    .optional(),
  targetHalfWidth: z.number().gt(0, { message: "targetHalfWidth must be > 0" }).lt(0.5, { message: "targetHalfWidth must be < 0.5" }).optional(),
  corners: z
    .array(z.number().min(-273.15, { message: "a corner is at least −273.15 °C" }).max(500, { message: "a corner is at most 500 °C" }))
    .min(1, { message: "list at least one temperature" })
    .max(10, { message: "at most 10 temperature corners" })
    .optional(),
  gradeOverrides: partRecord(partRef, z.string().min(1).max(MAX_GRADE_CODE_LENGTH)).optional(),
  toleranceOverrides: partRecord(partRef, toleranceOverrideSchema).optional(),
  label: z.string().trim().max(160, { message: "label is at most 160 characters" }).optional(),
  // No `sweepId`: which sweep a run belongs to is the server's to say (POST /api/sweeps); the strict object refuses
  // the field with a 400 naming it rather than ignoring it.
});

export type CreateRunInput = z.infer<typeof createRunSchema>;
