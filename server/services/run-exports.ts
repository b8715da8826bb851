/**
 * Exports of a stored run, all recomputed from the run's copied inputs and seed (nothing per trial is stored): the
 * trial replay, the trials CSV (in slices) and Touchstone v1.1 files of the nominal response and of any trial.
 *
 * The computing happens on the export thread (ctx.exportPool, workers/export-pool.ts), never on the thread
 * that answers requests. Each export runs under one AbortSignal (`exportSignal`): the client leaving, or the
 * export's time budget (`maxExportSeconds`, admin setting) running out, stops it. Replays and trial files need a
 * finished (`done`) run; the CSV's cost is checked against `maxExportCost` before anything is written.
 */
import { randomUUID } from "node:crypto";
import type { AppContext } from "../context";
import type { Run } from "../entities";
import { AppError } from "../errors";
import type { RunOptions } from "../../shared/engine/run-options";
import { shapeRun, trialCost } from "../../shared/engine/run-plan";
import { ruleName, type RunInputs } from "../../shared/formats/run-exports";
import { checkExportCost, runLimits } from "./run-limits";

export { csvNumber } from "../../shared/formats/run-exports";

/** Most trials one CSV export writes. */
export const MAX_CSV_TRIALS = 100_000;
/** Part evaluations per CSV slice (one export-thread task): about a tenth of a second. */
const CSV_SLICE_COST = 2e6;

const inputsOf = (run: Run): RunInputs => ({ netlist: run.netlist, limits: run.limits, options: run.options as unknown as RunOptions });

/** Trials a run has (or will have): the count stored when it finished (stop when sure may end early), else the requested total. */
export function trialCountOf(run: Run): number {
  return run.state === "done" ? run.trialsDone : run.trialsTotal;
}

/** The run's shape (validated, not solved: cheap on the request thread) covering `trials`; what prices its exports. */
function shapeOfRun(run: Run, trials: number) {
  return shapeRun(run.netlist, run.limits, { ...(run.options as unknown as RunOptions), trials: Math.max(trials, 1) });
}

/** Checks a trial index against the run. @throws AppError 400 naming `index` */
export function checkTrialIndex(raw: string, trials: number): number {
  const index = /^\d{1,9}$/.test(raw) ? Number(raw) : NaN;
  if (!Number.isInteger(index) || index >= trials) {
    const message = `must be a trial number 0..${trials - 1}`;
    throw new AppError("VALIDATION_FAILED", `index: ${message}`, { fields: { index: message } });
  }
  return index;
}

/** Trials of a finished run can be replayed and exported; a queued, running, failed or cancelled run has none to show. @throws AppError 409 RUN_NOT_DONE */
export function requireDone(run: Run): void {
  if (run.state !== "done") throw new AppError("RUN_NOT_DONE", `This run is ${run.state}; trials can be replayed and exported once it is done.`);
}

/** A signal for one export: aborted when `onGone` fires (the client left) or after the time budget; `dispose` clears the timer. */
export async function exportSignal(ctx: AppContext, onGone: (abort: () => void) => void): Promise<{ signal: AbortSignal; dispose(): void; seconds: number }> {
  const { maxExportSeconds } = await runLimits(ctx);
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(new AppError("EXPORT_TIMEOUT", `This export took longer than its budget of ${maxExportSeconds} s and was stopped.`, { headers: { "Retry-After": "60" } })), maxExportSeconds * 1000);
  timer.unref();
  onGone(() => controller.abort(new Error("client gone")));
  return { signal: controller.signal, seconds: maxExportSeconds, dispose: () => clearTimeout(timer) };
}

/** GET /api/runs/:id/trials/:index body: one trial replayed exactly from the seed (on the export thread). */
export async function trialReplay(ctx: AppContext, run: Run, index: number, signal: AbortSignal) {
  const cost = trialCost(shapeOfRun(run, index + 1));
  return ctx.exportPool.run(randomUUID(), cost, { kind: "replay", run: inputsOf(run), index }, signal);
}

/**
 * Touchstone v1.1 (.s2p) of the nominal response (index null) or of trial `index`, at 25 °C (on the export thread).
 * @throws AppError 400 when the netlist is not a two-port or its ports use different references
 *   (a v1.1 file holds one reference resistance)
 */
export async function runTouchstone(ctx: AppContext, run: Run, index: number | null, signal: AbortSignal): Promise<string> {
  const ports = run.netlist.ports;
  if (ports.length !== 2) throw new AppError("INVALID_INPUT", `A .s2p file needs a two-port; this netlist has ${ports.length} ports.`);
  if (ports[0].z0 !== ports[1].z0) {
    throw new AppError("INVALID_INPUT", `Touchstone 1.1 holds one reference resistance; this netlist's ports use ${ports[0].z0} and ${ports[1].z0} ohm.`);
  }
  const trials = Math.max(run.trialsTotal, (index ?? 0) + 1);
  return ctx.exportPool.run(randomUUID(), run.netlist.parts.length, { kind: "touchstone", run: inputsOf(run), trials, index, runId: run.id }, signal);
}

/**
 * CSV cells. Rule chosen for formula injection: numbers are written unquoted as plain numbers
 * (String(x), the shortest exact form; a negative margin stays a number a spreadsheet can sum);
 * every TEXT cell that starts with = + - @ (or tab / carriage return) gets a leading single quote;
 * text with a comma, quote or line break is double-quoted with inner quotes doubled.
 */
export function csvText(text: string): string {
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** The CSV header: trial, one value column per part ref, one margin column per rule, pass. */
export function trialsCsvHeader(run: Run): string {
  const cells = ["trial", ...run.netlist.parts.map((p) => p.ref), ...run.limits.rules.map((r) => `margin ${ruleName(r)}`), "pass"];
  return `${cells.map(csvText).join(",")}\n`;
}

/**
 * Checks a trials export before anything is written: at most MAX_CSV_TRIALS trials and within the export cost limit.
 * Returns the slices to compute and what one trial costs.
 * @throws AppError 400 naming `trials`
 */
export async function planTrialsCsv(ctx: AppContext, run: Run, trials: number): Promise<CsvPlan> {
  if (trials > MAX_CSV_TRIALS) {
    throw new AppError("INVALID_INPUT", `A trials export holds at most ${MAX_CSV_TRIALS} trials; this run has ${trials}.`, { fields: { trials: `at most ${MAX_CSV_TRIALS}` } });
  }
  // The shape (validated, not solved) is enough to price the export; the export thread builds the plan.
  const shape = shapeOfRun(run, trials);
  checkExportCost(shape, trials, await runLimits(ctx));
  const perTrial = trialCost(shape);
  const step = Math.max(1, Math.min(1000, Math.floor(CSV_SLICE_COST / perTrial)));
  const slices: { start: number; count: number }[] = [];
  for (let start = 0; start < trials; start += step) slices.push({ start, count: Math.min(step, trials - start) });
  return { trials, slices, perTrial };
}

/** A checked trials export: the slices to compute, each one export-thread task. */
export interface CsvPlan {
  trials: number;
  slices: { start: number; count: number }[];
  /** part evaluations of one trial (the fair gate's cost of a slice) */
  perTrial: number;
}

/**
 * The rows of a trials export, slice by slice, computed on the export thread one slice ahead of the writer.
 * Stops (rejecting with the signal's reason) when the signal aborts.
 */
export async function* trialsCsvRows(ctx: AppContext, run: Run, { trials, slices, perTrial }: CsvPlan, signal: AbortSignal): AsyncGenerator<string> {
  const key = randomUUID();
  const inputs = inputsOf(run);
  const compute = (s: { start: number; count: number }) => ctx.exportPool.run<string>(key, s.count * perTrial, { kind: "csv", run: inputs, trials: Math.max(trials, 1), start: s.start, count: s.count }, signal);
  try {
    let ahead: Promise<string> | null = slices.length ? compute(slices[0]) : null;
    for (let k = 0; k < slices.length; k++) {
      const current = ahead!;
      ahead = k + 1 < slices.length ? compute(slices[k + 1]) : null;
      ahead?.catch(() => undefined); // awaited next round; a failure meanwhile must not be unhandled
      yield await current;
    }
  } finally {
    ctx.exportPool.forget(key);
  }
}
