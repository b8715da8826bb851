import { z } from "zod";
import { MAX_FREQUENCY_HZ, MIN_FREQUENCY_HZ } from "../engine/frequency-grid";
import { limitsSchema } from "./limits";
import { netlistSchema } from "./netlist";

/**
 * JSON shape of a Monte Carlo run request (API and CLI edges). Mirrors RunOptions in
 * shared/engine/run-options.ts, whose guard checks run again inside the engine and the workers.
 */

export const runSeedSchema = z.union([
  z.number().int({ message: "seed must be an integer" }).min(0, { message: "seed must be ≥ 0" }).max(2147483647, { message: "seed must be ≤ 2147483647" }),
  z.string().min(1, { message: "seed must not be empty" }).max(200, { message: "seed is at most 200 characters" }),
]);

export const sweepSchema = z
  .strictObject({
    from: z
      .number()
      .nonnegative({ message: "from must be ≥ 0 Hz" })
      .max(MAX_FREQUENCY_HZ, { message: "from must be at most 1e12 Hz (1 THz)" })
      .refine((f) => f === 0 || f >= MIN_FREQUENCY_HZ, { message: "from must be 0 or at least 1e-3 Hz (1 mHz)" }),
    to: z.number().positive({ message: "to must be > 0 Hz" }).min(MIN_FREQUENCY_HZ, { message: "to must be at least 1e-3 Hz (1 mHz)" }).max(MAX_FREQUENCY_HZ, { message: "to must be at most 1e12 Hz (1 THz)" }),
    points: z.number().int({ message: "points must be an integer" }).min(2, { message: "points must be ≥ 2" }).max(10001, { message: "points must be ≤ 10001" }),
    scale: z.enum(["log", "lin"]).optional(),
  })
  .refine((s) => s.from < s.to, { message: "sweep needs from < to", path: ["to"] })
  .refine((s) => s.scale === "lin" || s.from > 0, { message: "from must be > 0 Hz for a log sweep", path: ["from"] });

export const runOptionsSchema = z.strictObject({
  trials: z.number().int({ message: "trials must be an integer" }).min(1, { message: "trials must be ≥ 1" }).max(100_000_000, { message: "trials must be ≤ 100000000" }),
  seed: runSeedSchema,
  sweep: sweepSchema.optional(),
  corners: z.array(z.number().min(-273.15).max(500)).min(1).max(10, { message: "at most 10 temperature corners" }).optional(),
  lotCorrelation: z.number().min(0).max(1).optional(),
  toleranceSigmas: z.number().min(1).max(6).optional(),
  targetHalfWidth: z.number().gt(0).lt(0.5).optional(),
  batchSize: z.number().int().min(1).max(1_000_000).optional(),
  envelopeBinDb: z.number().min(0.001).max(1).optional(),
  envelopeSpanDb: z.number().min(0.1).max(100).optional(),
  histogramBins: z.number().int().min(2).max(1000).optional(),
  sensitivitySampleSize: z.number().int().min(0).max(100_000).optional(),
  failingTrialCount: z.number().int().min(0).max(1000).optional(),
});

export const runRequestSchema = z.object({
  netlist: netlistSchema,
  limits: limitsSchema,
  options: runOptionsSchema,
});

export type RunOptionsInput = z.infer<typeof runOptionsSchema>;
export type RunRequestInput = z.infer<typeof runRequestSchema>;
