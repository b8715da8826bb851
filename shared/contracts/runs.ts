import { z } from "zod";
import type { RunResult } from "../engine/result";
import { intervalSchema, isoInstant, personRefSchema, shaped } from "./common";
import { storedLimitsSchema, storedNetlistSchema } from "./designs";
import { PART_KINDS, RUN_STATES, STRESS_CLASSES } from "./vocabulary";

/** Responses of the run routes: summaries, detail with result, replays, compare, sweeps, progress. */

/** One run as every list, page and compare view shows it. */
export const runSummarySchema = z.strictObject({
  id: z.string(),
  designId: z.string(),
  designName: z.string(),
  /** the design's use, for the safety cautions beside every result (null when the design row was not loaded) */
  designStress: z.enum(STRESS_CLASSES).nullable(),
  revisionId: z.string(),
  revisionNumber: z.number().int().nullable(),
  limitSetId: z.string().nullable(),
  sweepId: z.string().nullable(),
  label: z.string(),
  state: z.enum(RUN_STATES),
  trialsDone: z.number().int(),
  trialsTotal: z.number().int(),
  passed: z.number().int().nullable(),
  yield: z.number().nullable(),
  wilson95: intervalSchema.nullable(),
  seed: z.union([z.number(), z.string()]).nullable(),
  launchedBy: personRefSchema,
  queuedAt: isoInstant,
  startedAt: isoInstant.nullable(),
  finishedAt: isoInstant.nullable(),
  errorCode: z.string().nullable(),
  errorMessage: z.string().nullable(),
  bomCost: z.number().nullable(),
  lotSize: z.number().int(),
  /** times a server stop interrupted the run and it ran again from its seed (the result is the same) */
  interruptions: z.number().int(),
  lastInterruptedAt: isoInstant.nullable(),
});
export type RunSummary = z.infer<typeof runSummarySchema>;

/** The run's copied options (trials, seed, sweep, corners…), as stored with it. */
export const runOptionsViewSchema = z.looseObject({
  trials: z.number().optional(),
  seed: z.union([z.number(), z.string()]).optional(),
  corners: z.array(z.number()).optional(),
  targetHalfWidth: z.number().optional(),
});

/** GET /api/runs/:id's run: the summary plus the run's copied inputs. */
export const runDetailSchema = runSummarySchema.extend({
  options: runOptionsViewSchema,
  limits: storedLimitsSchema,
  gradeOverrides: z.record(z.string(), z.string()),
  netlist: storedNetlistSchema,
});
export type RunDetail = z.infer<typeof runDetailSchema>;

/**
 * The stored result: the engine's finalizeRun result plus, when the server stored them, the grid and the nominal
 * |S| dB curves. Its layout belongs to the engine and the store, so only its headline figures are checked here.
 */
export type RunResultView = RunResult & { freqs?: number[]; nominal?: Record<string, number[]> };
export const runResultViewSchema = shaped<RunResultView>(
  z.looseObject({ trials: z.number().int(), passed: z.number().int(), yield: z.number(), wilson95: intervalSchema, rules: z.array(z.unknown()) }),
);

/** Lot economics of a finished run; null until the run has a yield. */
export const economicsSchema = z.strictObject({
  lotSize: z.number(),
  bomCost: z.number(),
  /** lotSize · yield */
  expectedGood: z.number(),
  /** lotSize − expectedGood */
  scrapUnits: z.number(),
  /** scrapUnits · bomCost */
  scrapCost: z.number(),
  /** bomCost / yield (null at zero yield: no good unit) */
  costPerGoodUnit: z.number().nullable(),
});
export type RunEconomics = z.infer<typeof economicsSchema>;

export const runResponseSchema = z.strictObject({ run: runDetailSchema, result: runResultViewSchema.nullable(), economics: economicsSchema.nullable() });
export type RunResponse = z.infer<typeof runResponseSchema>;

/** POST /api/runs and POST /api/runs/:id/cancel. */
export const runSummaryResponseSchema = z.strictObject({ run: runSummarySchema });

/** One trial replayed from the run's seed, shown at 25 °C (or the first corner). */
export const trialReplaySchema = z.strictObject({
  index: z.number().int(),
  pass: z.boolean(),
  parts: z.array(z.strictObject({ ref: z.string(), kind: z.enum(PART_KINDS), nominal: z.number(), value: z.number(), deviation: z.number() })),
  margins: z.array(z.strictObject({ rule: z.number().int(), metric: z.string(), label: z.string(), margin: z.number() })),
  tempC: z.number(),
  freqs: z.array(z.number()),
  sDb: z.record(z.string(), z.array(z.number())),
  gdNs: z.array(z.number()),
});
export type TrialReplay = z.infer<typeof trialReplaySchema>;
export const trialReplayResponseSchema = z.strictObject({ trial: trialReplaySchema });

/** Live progress: the SSE `progress` event. */
export const runProgressSchema = z.strictObject({
  state: z.enum(RUN_STATES),
  trialsDone: z.number().int(),
  trialsTotal: z.number().int(),
  ratePerSecond: z.number().nullable(),
  etaSeconds: z.number().nullable(),
});
export type RunProgress = z.infer<typeof runProgressSchema>;

/** The SSE `end` event: the run's final state, or "signed-out" when the session ended while listening. */
export const runStreamEndSchema = z.strictObject({ state: z.union([z.enum(RUN_STATES), z.literal("signed-out")]) });
export type RunStreamEnd = z.infer<typeof runStreamEndSchema>;

/** GET /api/runs/:id/events: each event name and the JSON its `data:` line carries. */
export const RUN_STREAM_EVENTS = { progress: runProgressSchema, end: runStreamEndSchema } as const;

/** GET /api/runs: one page of run history. */
export const runPageSchema = z.strictObject({ runs: z.array(runSummarySchema), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });
export type RunPage = z.infer<typeof runPageSchema>;

export const compareEntrySchema = z.strictObject({ run: runSummarySchema, result: runResultViewSchema.nullable() });
export type CompareEntry = z.infer<typeof compareEntrySchema>;
export const compareResponseSchema = z.strictObject({ runs: z.array(compareEntrySchema) });

/** One row of a grade sweep's table. */
export const sweepRowSchema = z.strictObject({
  runId: z.string(),
  label: z.string(),
  state: z.enum(RUN_STATES),
  yield: z.number().nullable(),
  wilson95: intervalSchema.nullable(),
  bomCost: z.number().nullable(),
  /** bomCost / yield: what one good unit costs when the bad ones are scrapped (null before a yield, or at zero yield) */
  costPerGoodUnit: z.number().nullable(),
  /** done, and the 95 % Wilson lower bound of the yield ≥ the target */
  meetsTarget: z.boolean(),
});
export type SweepRow = z.infer<typeof sweepRowSchema>;

export const sweepHeadSchema = z.strictObject({ id: z.string(), name: z.string(), targetYield: z.number() });
export type SweepHead = z.infer<typeof sweepHeadSchema>;
export const sweepViewSchema = z.strictObject({
  id: z.string(),
  name: z.string(),
  designId: z.string(),
  revisionId: z.string(),
  targetYield: z.number(),
  createdAt: isoInstant,
});
export type SweepView = z.infer<typeof sweepViewSchema>;

export const createdSweepResponseSchema = z.strictObject({ sweep: sweepHeadSchema, runs: z.array(runSummarySchema) });
export type CreatedSweepResponse = z.infer<typeof createdSweepResponseSchema>;
export const sweepResponseSchema = z.strictObject({ sweep: sweepViewSchema, rows: z.array(sweepRowSchema), cheapestMeetingTarget: z.string().nullable() });
export type SweepResponse = z.infer<typeof sweepResponseSchema>;
