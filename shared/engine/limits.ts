/**
 * Acceptance limits: the rules a test station applies to every built filter.
 *
 * JSON shape: `{ "rules": [ { "metric": "s21_db", "from": 1e6, "to": 80e6, "min": -1, "label": "passband" }, … ] }`
 * - `metric`: `sIJ_db` — |S_IJ| in dB = 20·log10|S_IJ| for ports I, J (1-based single digits);
 *   `ripple_db` — peak-to-peak of |S21| dB over the band (max − min over the band's points);
 *   `gd_ns` — group delay −dφ21/dω of S21 in ns.
 * - `from` < `to` (Hz, positive), the band; both edges are evaluated exactly (see frequency-grid.ts).
 * - `min` and/or `max` (dB or ns); with both, min ≤ max. At most 100 rules.
 */
import { EngineError } from "./errors";
import { MAX_FREQUENCY_HZ, MIN_FREQUENCY_HZ } from "./frequency-grid";

/** Most rules a limit set may hold. */
export const MAX_RULES = 100;

/** One acceptance rule over a frequency band. */
export interface LimitRule {
  metric: string;
  /** band start (Hz) */
  from: number;
  /** band end (Hz) */
  to: number;
  /** lower limit (dB or ns) */
  min?: number;
  /** upper limit (dB or ns) */
  max?: number;
  /** optional display name */
  label?: string;
}

/** A limit set. */
export interface Limits {
  rules: LimitRule[];
}

/** A parsed metric; port indices are zero-based. */
export type Metric =
  | { kind: "s_db"; i: number; j: number }
  | { kind: "ripple_db"; i: 1; j: 0 }
  | { kind: "gd_ns"; i: 1; j: 0 };

/** A validated rule with its parsed metric. */
export interface CompiledRule extends LimitRule {
  index: number;
  parsed: Metric;
  /** unit of the margin: "dB" or "ns" */
  unit: "dB" | "ns";
}

const S_METRIC = /^s([1-9])([1-9])_db$/;

/**
 * Parses a metric name.
 * @returns the parsed metric, or null when the name is not a Lotwise metric
 * @example parseMetric("s21_db") // { kind: "s_db", i: 1, j: 0 }
 */
export function parseMetric(metric: string): Metric | null {
  const m = S_METRIC.exec(metric);
  if (m) return { kind: "s_db", i: Number(m[1]) - 1, j: Number(m[2]) - 1 };
  if (metric === "ripple_db") return { kind: "ripple_db", i: 1, j: 0 };
  if (metric === "gd_ns") return { kind: "gd_ns", i: 1, j: 0 };
  return null;
}

/**
 * Validates a limit set against a netlist's port count and compiles its rules.
 * @param limits candidate limits (untrusted JSON)
 * @param portCount the netlist's number of ports (metrics may not name a port beyond it)
 * @returns the rules, in order, with parsed metrics
 * @throws EngineError INVALID_LIMITS with `path` "rules[k].field" and a readable message
 */
export function validateLimits(limits: unknown, portCount: number): CompiledRule[] {
  if (typeof limits !== "object" || limits === null || !Array.isArray((limits as Limits).rules)) {
    throw invalid("rules", "limits must be an object with a `rules` array");
  }
  const rules = (limits as Limits).rules;
  if (rules.length > MAX_RULES) throw invalid("rules", `at most ${MAX_RULES} rules are allowed (got ${rules.length})`);
  return rules.map((rule, k) => validateRule(rule, k, portCount));
}

function validateRule(rule: unknown, k: number, portCount: number): CompiledRule {
  const at = (field: string) => `rules[${k}]${field ? "." + field : ""}`;
  if (typeof rule !== "object" || rule === null) throw invalid(at(""), `rule ${k + 1} must be an object`);
  const r = rule as Record<string, unknown>;
  if (typeof r.metric !== "string") throw invalid(at("metric"), `rule ${k + 1}: \`metric\` must be a string such as "s21_db", "ripple_db" or "gd_ns"`);
  const parsed = parseMetric(r.metric);
  if (!parsed) throw invalid(at("metric"), `rule ${k + 1}: unknown metric "${r.metric}" (use sIJ_db, ripple_db or gd_ns)`);
  if (parsed.i >= portCount || parsed.j >= portCount) {
    throw invalid(at("metric"), `rule ${k + 1}: metric "${r.metric}" names port ${Math.max(parsed.i, parsed.j) + 1} but the netlist has ${portCount} ports`);
  }
  for (const f of ["from", "to"] as const) {
    const v = r[f];
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) throw invalid(at(f), `rule ${k + 1}: \`${f}\` must be a positive frequency in Hz`);
    if (v < MIN_FREQUENCY_HZ || v > MAX_FREQUENCY_HZ) throw invalid(at(f), `rule ${k + 1}: \`${f}\` must be between ${MIN_FREQUENCY_HZ} Hz and ${MAX_FREQUENCY_HZ} Hz (1 mHz to 1 THz)`);
  }
  const from = r.from as number;
  const to = r.to as number;
  if (from >= to) throw invalid(at("to"), `rule ${k + 1}: band must have from < to (got from ${from} Hz, to ${to} Hz)`);
  for (const f of ["min", "max"] as const) {
    const v = r[f];
    if (v !== undefined && (typeof v !== "number" || !Number.isFinite(v))) throw invalid(at(f), `rule ${k + 1}: \`${f}\` must be a finite number`);
  }
  const min = r.min as number | undefined;
  const max = r.max as number | undefined;
  if (min === undefined && max === undefined) throw invalid(at("min"), `rule ${k + 1}: needs \`min\` and/or \`max\``);
  if (min !== undefined && max !== undefined && min > max) throw invalid(at("min"), `rule ${k + 1}: \`min\` (${min}) is greater than \`max\` (${max})`);
  if (r.label !== undefined && (typeof r.label !== "string" || r.label.length > 120)) throw invalid(at("label"), `rule ${k + 1}: \`label\` must be a string of at most 120 characters`);
  const out: CompiledRule = { index: k, metric: r.metric, from, to, parsed, unit: parsed.kind === "gd_ns" ? "ns" : "dB" };
  if (min !== undefined) out.min = min;
  if (max !== undefined) out.max = max;
  if (r.label !== undefined) out.label = r.label as string;
  return out;
}

function invalid(path: string, message: string): EngineError {
  return new EngineError("INVALID_LIMITS", message, { path });
}
