import { z } from "zod";

/**
 * The compute limits the admin sets (PUT /api/settings/compute-limits). A run's or an export's *cost* is counted in
 * part evaluations: trials × temperature corners × frequency points × parts — what the engine does per run, up to a
 * constant. One thread of this project's bench machine does roughly 25 million a second on a ladder (npm run bench
 * prints the figure).
 */
export const DEFAULT_COMPUTE_LIMITS = {
  /** most part evaluations one run may ask for (default 2·10¹⁰: about 15 minutes of one thread) */
  maxRunCost: 2e10,
  /**
   * most part evaluations of one trial (corners × points × parts; default 3·10⁶: about a second of one thread even
   * on the largest circuits). A trial is the smallest piece of work a thread takes, so this bounds how long another
   * person's run can wait for a thread.
   */
  maxTrialCost: 3e6,
  /** most part evaluations one export (trials CSV) may take (default 10⁹: under a minute of one thread) */
  maxExportCost: 1e9,
  /** wall-clock budget of one replay or export on the export thread; past it the export is stopped */
  maxExportSeconds: 60,
} as const;

const cost = (what: string) =>
  z.number({ message: `${what} must be a number` }).int({ message: `${what} must be a whole number` }).min(1e6, { message: `${what} must be at least 1e6` }).max(1e15, { message: `${what} must be at most 1e15` });

export const computeLimitsSchema = z.strictObject({
  maxRunCost: cost("maxRunCost"),
  maxTrialCost: z.number({ message: "maxTrialCost must be a number" }).int({ message: "maxTrialCost must be a whole number" }).min(1e4, { message: "maxTrialCost must be at least 1e4" }).max(1e12, { message: "maxTrialCost must be at most 1e12" }),
  maxExportCost: cost("maxExportCost"),
  maxExportSeconds: z.number({ message: "maxExportSeconds must be a number" }).int({ message: "maxExportSeconds must be a whole number" }).min(1, { message: "maxExportSeconds must be ≥ 1" }).max(3600, { message: "maxExportSeconds must be ≤ 3600" }),
});

export type ComputeLimits = z.infer<typeof computeLimitsSchema>;

/** The cost of evaluating `trials` trials (part evaluations). */
export function computeCost(shape: { trials: number; corners: number; points: number; parts: number }): number {
  return shape.trials * shape.corners * shape.points * shape.parts;
}
