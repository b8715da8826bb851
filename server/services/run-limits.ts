/**
 * Compute limits: what one run or one export may cost (shared/schemas/settings.ts), stored as one `app_setting` row the
 * admin changes, with the defaults when absent. Checked when a run is created (before anything is stored) and when an
 * export starts; a request over the limit gets 400 naming the field that drives the cost and the limit.
 */
import type { AppContext } from "../context";
import { AppSetting } from "../entities";
import { AppError } from "../errors";
import type { RunShape } from "../../shared/engine/run-plan";
import { computeCost, computeLimitsSchema, DEFAULT_COMPUTE_LIMITS, type ComputeLimits } from "../../shared/schemas/settings";

const KEY = "compute-limits";

/** The limits in force (stored ones over the defaults; a stored value that no longer parses is ignored). */
export async function runLimits(ctx: Pick<AppContext, "dataSource">): Promise<ComputeLimits> {
  const row = await ctx.dataSource.getRepository(AppSetting).findOneBy({ key: KEY });
  const parsed = computeLimitsSchema.safeParse({ ...DEFAULT_COMPUTE_LIMITS, ...(row?.value as object | undefined) });
  return parsed.success ? parsed.data : { ...DEFAULT_COMPUTE_LIMITS };
}

export async function saveRunLimits(ctx: Pick<AppContext, "dataSource">, userId: string, limits: ComputeLimits): Promise<ComputeLimits> {
  await ctx.dataSource.getRepository(AppSetting).upsert({ key: KEY, value: limits, updatedById: userId, updatedAt: new Date() }, ["key"]);
  return runLimits(ctx);
}

/** What sets a run's cost. */
export interface CostShape {
  trials: number;
  corners: number;
  points: number;
  parts: number;
}

/** The cost shape of a run's shape (shared/engine/run-plan.ts: validated, not solved). */
export function shapeCost(shape: RunShape, trials = shape.options.trials): CostShape {
  return { trials, corners: shape.options.corners.length, points: shape.points, parts: shape.parts };
}

const fmt = (x: number) => x.toExponential(2).replace("e+", "e");
const n = (x: number) => x.toLocaleString("en-US");

/**
 * Refuses a run whose cost is over the limit, naming `trials` (the field the person sets) with what the circuit costs.
 * @throws AppError 400 RUN_TOO_COSTLY
 */
export function checkRunCost(shape: CostShape, limits: ComputeLimits): void {
  const cost = computeCost(shape);
  const perTrial = computeCost({ ...shape, trials: 1 });
  if (cost <= limits.maxRunCost) return checkTrialCost(shape, perTrial, limits);
  const most = Math.max(0, Math.floor(limits.maxRunCost / perTrial));
  const message =
    `this run would cost ${fmt(cost)} part evaluations (${n(shape.trials)} trials × ${shape.corners} corner${shape.corners === 1 ? "" : "s"} × ${n(shape.points)} frequency points × ${shape.parts} parts); ` +
    `the limit is ${fmt(limits.maxRunCost)}` + (most >= 1 ? `, so at most ${most} trials for this circuit` : "; fewer points, corners or parts are needed") + ".";
  throw new AppError("RUN_TOO_COSTLY", `trials: ${message}`, { fields: { trials: message } });
}

/**
 * Refuses a run one trial of which costs more than the per-trial limit (a thread is held for a whole trial, so this
 * bounds how long other runs wait), naming `corners` when there are several, else `revisionId` (its sweep and parts).
 * @throws AppError 400 RUN_TOO_COSTLY
 */
function checkTrialCost(shape: CostShape, perTrial: number, limits: ComputeLimits): void {
  if (perTrial <= limits.maxTrialCost) return;
  const field = shape.corners > 1 ? "corners" : "revisionId";
  const message =
    `one trial of this run would cost ${fmt(perTrial)} part evaluations (${shape.corners} corner${shape.corners === 1 ? "" : "s"} × ${n(shape.points)} frequency points × ${shape.parts} parts); ` +
    `the limit per trial is ${fmt(limits.maxTrialCost)}: use fewer corners, a coarser sweep or ask the admin to raise the limit.`;
  throw new AppError("RUN_TOO_COSTLY", `${field}: ${message}`, { fields: { [field]: message } });
}

/**
 * Refuses an export of `trials` trials of a plan over the export limit.
 * @throws AppError 400 RUN_TOO_COSTLY naming `trials`
 */
export function checkExportCost(shape: RunShape, trials: number, limits: ComputeLimits): void {
  const cost = computeCost(shapeCost(shape, trials));
  if (cost <= limits.maxExportCost) return;
  const message = `exporting ${n(trials)} trials of this run would cost ${fmt(cost)} part evaluations; the export limit is ${fmt(limits.maxExportCost)}.`;
  throw new AppError("RUN_TOO_COSTLY", `trials: ${message}`, { fields: { trials: message } });
}
