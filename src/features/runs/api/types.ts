import type { EnvelopeSeries, RuleSummary, RunResult } from "@shared/engine/result";
import type { Histogram } from "@shared/engine/stats/histogram";
/** A run's life: queued → running → done | failed | cancelled (same words as the server's run entity). */
export const RUN_STATES = ["queued", "running", "done", "failed", "cancelled"] as const;
export type RunState = (typeof RUN_STATES)[number];

/** A person as the API names them. */
export type PersonRef = { id: string; name: string };

/** One run as lists and headers show it (GET /api/runs, RunSummary in the workflow contract). */
export type RunSummary = {
  id: string;
  designId: string;
  designName: string;
  designStress: "small-signal" | "mains" | "high-power-rf" | null;
  revisionId: string;
  revisionNumber: number;
  limitSetId: string | null;
  sweepId: string | null;
  label: string;
  state: RunState;
  trialsDone: number;
  trialsTotal: number;
  passed: number | null;
  yield: number | null;
  wilson95: [number, number] | null;
  seed: number | string;
  launchedBy: PersonRef;
  queuedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  errorCode: string | null;
  errorMessage: string | null;
  bomCost: number | null;
  lotSize: number;
  /** times a server stop interrupted the run and it ran again from its seed (same result) */
  interruptions: number;
  lastInterruptedAt: string | null;
};

// The engine's own result types are already JSON-safe (plain numbers and arrays).
export type HistogramJson = Histogram;
export type RuleSummaryJson = RuleSummary;
export type EnvelopeSeriesJson = EnvelopeSeries;

/** The engine's finalizeRun result (already JSON-safe), plus the grid and nominal |S| dB curves the server adds. */
export type RunResultJson = RunResult & {
  freqs?: number[];
  nominal?: Record<string, number[]>;
};

export type Economics = {
  lotSize: number;
  bomCost: number;
  expectedGood: number;
  scrapUnits: number;
  scrapCost: number;
  costPerGoodUnit: number | null;
};

export type LimitRuleJson = { metric: string; from: number; to: number; min?: number; max?: number; label?: string };

export type NetlistPartJson = {
  ref: string;
  kind: "R" | "L" | "C";
  nodes: [string, string];
  value: number;
  tolerance?: number;
  toleranceAbs?: number;
  distribution?: "normal" | "uniform";
  series?: string;
  grade?: string;
};

export type NetlistJson = { ports: { name: string; node: string; z0: number }[]; parts: NetlistPartJson[]; name?: string };

export type RunDetail = RunSummary & {
  options: { trials?: number; seed?: number | string; corners?: number[]; targetHalfWidth?: number } & Record<string, unknown>;
  limits: { rules: LimitRuleJson[] };
  gradeOverrides: Record<string, string>;
  netlist: NetlistJson;
};

export type RunResponse = { run: RunDetail; result: RunResultJson | null; economics: Economics | null };

/** One replayed trial (GET /api/runs/:id/trials/:index). */
export type TrialReplay = {
  index: number;
  pass: boolean;
  parts: { ref: string; kind: "R" | "L" | "C"; nominal: number; value: number; deviation: number }[];
  margins: { rule: number; label: string; margin: number }[];
  freqs: number[];
  sDb: Record<string, number[]>;
  gdNs: number[];
};

/** Live progress (SSE `progress` event, or derived from polling). */
export type RunProgress = { state: RunState; trialsDone: number; trialsTotal: number; ratePerSecond: number | null; etaSeconds: number | null };

export const FINISHED_STATES: readonly RunState[] = ["done", "failed", "cancelled"];

export function isFinished(state: RunState): boolean {
  return FINISHED_STATES.includes(state);
}
