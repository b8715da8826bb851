/**
 * Worker task for the exports of a stored run (the server's export thread: workers/export-pool.ts): a trial
 * replay, a slice of trials-CSV rows, or Touchstone text. Each is computed from the run's inputs and seed; plans of
 * the last few runs are kept so the slices of one CSV export build the run's plan once. An EngineError comes back as
 * `{ error }` (structured cloning would drop its code); anything else rejects the task.
 */
import { isEngineError } from "../shared/engine/errors";
import { planRun, type RunPlan } from "../shared/engine/run-plan";
import { runTouchstoneText, trialCsvRows, trialReplayView, type RunInputs } from "../shared/formats/run-exports";
import { serializeEngineError, type SerializedEngineError } from "../shared/engine/task-errors";

/** One export task. `trials` is how many trials the plan must cover. */
export type ExportTask =
  | { kind: "replay"; run: RunInputs; index: number }
  | { kind: "csv"; run: RunInputs; trials: number; start: number; count: number }
  | { kind: "touchstone"; run: RunInputs; trials: number; index: number | null; runId: string };

export type ExportResult = { ok: unknown } | { error: SerializedEngineError };

const plans = new Map<string, RunPlan>();

function planOf(run: RunInputs, trials: number): RunPlan {
  const options = { ...run.options, trials };
  const key = JSON.stringify([run.netlist, run.limits, options]);
  let plan = plans.get(key);
  if (!plan) {
    plan = planRun(run.netlist, run.limits, options);
    plans.set(key, plan);
    if (plans.size > 2) plans.delete(plans.keys().next().value as string);
  }
  return plan;
}

export default function runExportTask(task: ExportTask): ExportResult {
  try {
    if (task.kind === "replay") return { ok: trialReplayView(task.run, task.index, planOf(task.run, Math.max(task.run.options.trials ?? 1, task.index + 1))) };
    if (task.kind === "csv") return { ok: trialCsvRows(planOf(task.run, task.trials), task.start, task.count) };
    return { ok: runTouchstoneText(planOf(task.run, task.trials), task.index, { runId: task.runId }) };
  } catch (err) {
    if (isEngineError(err)) return { error: serializeEngineError(err) };
    throw err;
  }
}
