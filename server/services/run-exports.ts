/**
 * Exports of a stored run, all recomputed from the run's copied inputs and seed (nothing per trial is
 * stored): the trial replay, the trials CSV (streamed) and Touchstone v1.1 files of the nominal
 * response and of any trial.
 */
import type { Response } from "express";
import type { Run } from "../entities";
import { AppError } from "../errors";
import { replayTrial } from "../../shared/engine/monte-carlo";
import { createTrialStream } from "../../shared/engine/random";
import { evaluateMarginsDb, fillMagnitudeDb } from "../../shared/engine/rules";
import type { RunOptions } from "../../shared/engine/run-options";
import { planRun, type RunPlan } from "../../shared/engine/run-plan";
import { sampleTrial } from "../../shared/engine/sampling";
import { nominalValues } from "../../shared/engine/solver";
import { writeTouchstone } from "../../shared/formats/touchstone";

/** Most trials one CSV export writes. */
export const MAX_CSV_TRIALS = 100_000;

const optionsOf = (run: Run) => run.options as unknown as RunOptions;

/** Trials a run has (or will have): the result's count when done, else the requested total. */
export function trialCountOf(run: Run, result: { trials?: unknown } | null): number {
  return typeof result?.trials === "number" ? result.trials : run.trialsTotal;
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

/** Short text for a rule: its label, or metric and band. */
function ruleName(rule: { label?: string; metric: string; from: number; to: number }): string {
  return rule.label || `${rule.metric} ${rule.from}–${rule.to} Hz`;
}

/** GET /api/runs/:id/trials/:index body: one trial replayed exactly from the seed. */
export function presentTrialReplay(run: Run, index: number) {
  const options = optionsOf(run);
  const replay = replayTrial(run.netlist, run.limits, options, options.seed, index);
  const rules = run.limits.rules;
  const shown = replay.corners.find((c) => c.tempC === 25) ?? replay.corners[0];
  const sDb: Record<string, number[]> = {};
  for (const [name, values] of Object.entries(shown.sDb)) sDb[name.replace(/_db$/, "")] = values;
  return {
    trial: {
      index,
      pass: replay.pass,
      parts: replay.parts.map((p, k) => ({ ...p, kind: run.netlist.parts[k].kind })),
      margins: replay.margins.map((margin, r) => ({ rule: r, metric: rules[r].metric, label: ruleName(rules[r]), margin })),
      tempC: shown.tempC,
      freqs: replay.freqs,
      sDb,
      gdNs: shown.gd21Ns,
    },
  };
}

/**
 * Touchstone v1.1 (.s2p) of the nominal response (index null) or of trial `index`, at 25 °C.
 * @throws AppError 400 when the netlist is not a two-port or its ports use different references
 *   (a v1.1 file holds one reference resistance)
 */
export function runTouchstone(run: Run, index: number | null): string {
  const ports = run.netlist.ports;
  if (ports.length !== 2) throw new AppError("INVALID_INPUT", `A .s2p file needs a two-port; this netlist has ${ports.length} ports.`);
  if (ports[0].z0 !== ports[1].z0) {
    throw new AppError("INVALID_INPUT", `Touchstone 1.1 holds one reference resistance; this netlist's ports use ${ports[0].z0} and ${ports[1].z0} ohm.`);
  }
  const plan = planRun(run.netlist, run.limits, { ...optionsOf(run), trials: Math.max(run.trialsTotal, (index ?? 0) + 1) });
  const values = index === null ? nominalValues(plan.compiled) : new Float64Array(plan.sampling.partCount);
  if (index !== null) sampleTrial(plan.sampling, createTrialStream(plan.options.seed, index), values);
  const buf = plan.evaluator.evaluate(values, 25);
  const what = index === null ? "nominal response" : `trial ${index}`;
  return writeTouchstone(
    { freqs: buf.freqs, s: buf.s, ports: 2, z0: ports[0].z0 },
    { comment: [`Lotwise run ${run.id}: ${what} at 25 °C`, `seed ${String(plan.options.seed)}, ${run.netlist.name ?? "netlist"}`] },
  );
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

export function csvNumber(x: number): string {
  return Number.isFinite(x) ? String(x) : "";
}

/** The CSV header: trial, one value column per part ref, one margin column per rule, pass. */
export function trialsCsvHeader(run: Run): string {
  const cells = ["trial", ...run.netlist.parts.map((p) => p.ref), ...run.limits.rules.map((r) => `margin ${ruleName(r)}`), "pass"];
  return `${cells.map(csvText).join(",")}\n`;
}

/**
 * Streams `trial,<part values…>,<worst margin per rule…>,pass` for trials 0..trials−1, in slices of
 * 250 rows with a turn of the event loop between them and waiting for `drain` when the socket is full.
 * @throws AppError 400 beyond MAX_CSV_TRIALS (before anything is written)
 */
export async function streamTrialsCsv(res: Response, run: Run, trials: number): Promise<void> {
  if (trials > MAX_CSV_TRIALS) {
    throw new AppError("INVALID_INPUT", `A trials export holds at most ${MAX_CSV_TRIALS} trials; this run has ${trials}.`, { fields: { trials: `at most ${MAX_CSV_TRIALS}` } });
  }
  const plan: RunPlan = planRun(run.netlist, run.limits, { ...optionsOf(run), trials: Math.max(trials, 1) });
  res.status(200);
  res.set("Content-Type", "text/csv; charset=utf-8");
  res.set("Content-Disposition", `attachment; filename="lotwise-run-${run.id.slice(0, 8)}-trials.csv"`);
  res.write(trialsCsvHeader(run));
  const P = plan.sampling.partCount;
  const R = plan.rules.length;
  const values = new Float64Array(P);
  const margins = new Float64Array(R);
  const worst = new Float64Array(R);
  const db = new Float64Array(plan.pairs.length * plan.grid.freqs.length);
  let gone = false;
  res.once("close", () => (gone = true));
  for (let start = 0; start < trials && !gone; start += 250) {
    let text = "";
    for (let t = start; t < Math.min(trials, start + 250); t++) {
      sampleTrial(plan.sampling, createTrialStream(plan.options.seed, t), values);
      worst.fill(Infinity);
      for (const tempC of plan.options.corners) {
        const buf = plan.evaluator.evaluate(values, tempC);
        fillMagnitudeDb(buf, db);
        evaluateMarginsDb(db, buf, plan.rules, margins);
        for (let r = 0; r < R; r++) if (margins[r] < worst[r]) worst[r] = margins[r];
      }
      const pass = worst.every((m) => m >= 0);
      text += `${t},${Array.from(values, csvNumber).join(",")}${R ? "," : ""}${Array.from(worst, csvNumber).join(",")},${pass}\n`;
    }
    if (!res.write(text)) await new Promise<void>((resolve) => { res.once("drain", resolve); res.once("close", resolve); });
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  res.end();
}
