/**
 * What the exports of a stored run compute, from the run's copied inputs and seed alone (nothing per trial is
 * stored): one trial replayed for the trial page, rows of the trials CSV, and Touchstone v1.1 text of the nominal
 * response or of one trial. Pure and synchronous: the server runs them on its export thread
 * (workers/exports.worker.ts), never on the thread that answers requests.
 */
import { writeTouchstone } from "./touchstone";
import { replayTrial, replayTrialOnPlan } from "../engine/monte-carlo";
import type { Netlist } from "../engine/netlist";
import { createTrialStream } from "../engine/random";
import type { RunOptions } from "../engine/run-options";
import type { RunPlan } from "../engine/run-plan";
import { evaluateMarginsDb, fillMagnitudeDb } from "../engine/rules";
import { sampleTrial } from "../engine/sampling";
import { nominalValues } from "../engine/solver";

/** The stored inputs of a run that every export needs. */
export interface RunInputs {
  netlist: Netlist;
  limits: { rules: { label?: string; metric: string; from: number; to: number }[] };
  options: RunOptions;
}

/** Short text for a rule: its label, or metric and band. */
export function ruleName(rule: { label?: string; metric: string; from: number; to: number }): string {
  return rule.label || `${rule.metric} ${rule.from}–${rule.to} Hz`;
}

/** A number cell of the trials CSV: the shortest exact form; non-finite values are left empty. */
export function csvNumber(x: number): string {
  return Number.isFinite(x) ? String(x) : "";
}

/** The body of GET /api/runs/:id/trials/:index: one trial replayed exactly from the seed, shown at 25 °C (or the first corner). */
export function trialReplayView(run: RunInputs, index: number, plan?: RunPlan) {
  const options = run.options;
  const replay = plan ? replayTrialOnPlan(plan, index) : replayTrial(run.netlist, run.limits, options, options.seed, index);
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
 * Rows `trial,<part values…>,<worst margin per rule…>,pass` of trials [start, start + count) of a planned run.
 * The plan must cover the trials (its `trials` ≥ start + count).
 */
export function trialCsvRows(plan: RunPlan, start: number, count: number): string {
  const P = plan.sampling.partCount;
  const R = plan.rules.length;
  const values = new Float64Array(P);
  const margins = new Float64Array(R);
  const worst = new Float64Array(R);
  const db = new Float64Array(plan.pairs.length * plan.grid.freqs.length);
  let text = "";
  for (let t = start; t < start + count; t++) {
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
  return text;
}

/**
 * Touchstone v1.1 (.s2p) text of the nominal response (index null) or of trial `index`, at 25 °C, of a planned run
 * whose netlist is a two-port with one reference resistance (checked by the caller).
 */
export function runTouchstoneText(plan: RunPlan, index: number | null, comment: { runId: string }): string {
  const values = index === null ? nominalValues(plan.compiled) : new Float64Array(plan.sampling.partCount);
  if (index !== null) sampleTrial(plan.sampling, createTrialStream(plan.options.seed, index), values);
  const buf = plan.evaluator.evaluate(values, 25);
  const what = index === null ? "nominal response" : `trial ${index}`;
  const z0 = plan.netlist.ports[0].z0;
  return writeTouchstone(
    { freqs: buf.freqs, s: buf.s, ports: 2, z0 },
    { comment: [`Lotwise run ${comment.runId}: ${what} at 25 °C`, `seed ${String(plan.options.seed)}, ${plan.netlist.name ?? "netlist"}`] },
  );
}
