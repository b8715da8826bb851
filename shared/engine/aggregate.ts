/**
 * Mergeable aggregates of Monte Carlo trials: everything a run reports, with no per-trial data
 * beyond the bounded sensitivity sample. Every field merges exactly and order-independently:
 * integer counts, exact-sum partials (stats/exact-sum.ts), min/max, the first K failing trial
 * indices, and sample segments keyed by trial index. Hence one seed gives bit-identical results
 * for one chunk or many, one worker or several.
 */
import { EngineError } from "./errors";
import type { RunPlan } from "./run-plan";
import type { RunSeed } from "./random";
import { exactSumCanonicalize, exactSumMerge, type ExactSum } from "./stats/exact-sum";
import { addCounts, type HistogramEdges } from "./stats/histogram";

/** Facts about the run shared by every chunk (from the plan), needed to finalize. */
export interface AggregateMeta {
  seed: RunSeed;
  trialCap: number;
  corners: number[];
  partRefs: string[];
  rules: { metric: string; label?: string; from: number; to: number; min?: number; max?: number; unit: "dB" | "ns" }[];
  freqs: number[];
  pairs: string[];
  nominalMargins: number[];
  marginEdges: HistogramEdges[];
  nominalDb: number[];
  envelopeBins: number;
  envelopeBinDb: number;
  envelopeSpanDb: number;
  sensitivitySampleSize: number;
  failingTrialCount: number;
}

/** A contiguous run of trials kept for the sensitivity analysis. */
export interface SampleSegment {
  /** first trial index */
  start: number;
  count: number;
  /** relative deviation of each part, index t·P + p */
  deviations: Float64Array;
  /** worst margin of each rule, index t·R + r */
  margins: Float64Array;
}

/** Aggregate of any set of trials of one run. */
export interface TrialAggregate {
  meta: AggregateMeta;
  /** trials counted */
  trials: number;
  passed: number;
  /** covered trial index ranges [start, end), sorted and disjoint */
  ranges: [number, number][];
  ruleFailures: number[];
  marginSum: ExactSum[];
  marginSumSq: ExactSum[];
  marginMin: number[];
  marginMax: number[];
  /** per rule (bins + 2) counts: [underflow, bins…, overflow] */
  marginCounts: Float64Array;
  /** per pair, per grid point (envelopeBins + 2) counts */
  envelopeCounts: Uint32Array;
  /** first failing trial indices, ascending, at most failingTrialCount */
  failing: number[];
  sample: SampleSegment[];
  /**
   * The envelope counts as (index, count) pairs instead of `envelopeCounts` (then empty), when most cells are zero: how
   * a chunk of few trials travels from a worker (decodeAggregate), so its transfer and merge cost follow the trials,
   * not the 4-million-cell envelope. mergeInto takes either form; a merged total is always dense.
   */
  envelopeSparse?: { length: number; index: Uint32Array; count: Uint32Array };
}

/** The envelope counts of an aggregate as a dense array (copied from the sparse form when it has one). */
export function denseEnvelope(agg: TrialAggregate): Uint32Array {
  const sp = agg.envelopeSparse;
  if (!sp) return agg.envelopeCounts;
  const dense = new Uint32Array(sp.length);
  for (let k = 0; k < sp.index.length; k++) dense[sp.index[k]] = sp.count[k];
  return dense;
}

/** An empty aggregate for a plan. */
export function createAggregate(plan: RunPlan): TrialAggregate {
  return emptyAggregate(metaOf(plan), plan.rules.length, plan.rules.length * (plan.options.histogramBins + 2), plan.pairs.length * plan.grid.freqs.length * (plan.envelopeBins + 2));
}

function emptyAggregate(meta: AggregateMeta, rules: number, marginCells: number, envelopeCells: number): TrialAggregate {
  return {
    meta,
    trials: 0,
    passed: 0,
    ranges: [],
    ruleFailures: new Array(rules).fill(0),
    marginSum: Array.from({ length: rules }, () => []),
    marginSumSq: Array.from({ length: rules }, () => []),
    marginMin: new Array(rules).fill(Infinity),
    marginMax: new Array(rules).fill(-Infinity),
    marginCounts: new Float64Array(marginCells),
    envelopeCounts: new Uint32Array(envelopeCells),
    failing: [],
    sample: [],
  };
}

/** An empty aggregate of the same run as `agg` (same meta and sizes): what a driver starts from when it has no plan. */
export function emptyAggregateLike(agg: TrialAggregate): TrialAggregate {
  return emptyAggregate(agg.meta, agg.ruleFailures.length, agg.marginCounts.length, agg.envelopeSparse?.length ?? agg.envelopeCounts.length);
}

/**
 * Merges b into a copy of a (neither input is changed). Exact and order-independent.
 * @throws EngineError INVALID_INPUT when the aggregates belong to different runs or overlap
 */
export function mergeAggregates(a: TrialAggregate, b: TrialAggregate): TrialAggregate {
  const { envelopeSparse: _sparse, ...dense } = a;
  const copy: TrialAggregate = {
    ...dense,
    ranges: a.ranges.map((r) => [r[0], r[1]] as [number, number]),
    ruleFailures: a.ruleFailures.slice(),
    marginSum: a.marginSum.map((x) => x.slice()),
    marginSumSq: a.marginSumSq.map((x) => x.slice()),
    marginMin: a.marginMin.slice(),
    marginMax: a.marginMax.slice(),
    marginCounts: a.marginCounts.slice(),
    envelopeCounts: a.envelopeSparse ? denseEnvelope(a) : a.envelopeCounts.slice(),
    failing: a.failing.slice(),
    sample: a.sample.slice(),
  };
  mergeInto(copy, b);
  return copy;
}

/**
 * Merges b into target in place (b is not changed); the same exact, order-independent merge as
 * mergeAggregates without copying the large count arrays.
 * @throws EngineError INVALID_INPUT when the aggregates belong to different runs or overlap
 */
export function mergeInto(target: TrialAggregate, b: TrialAggregate): void {
  if (!sameRun(target.meta, b.meta)) throw new EngineError("INVALID_INPUT", "cannot merge aggregates of different runs", { path: "aggregate.meta" });
  target.ranges = mergeRanges(target.ranges, b.ranges);
  target.trials += b.trials;
  target.passed += b.passed;
  for (let r = 0; r < target.ruleFailures.length; r++) {
    target.ruleFailures[r] += b.ruleFailures[r];
    exactSumCanonicalize(exactSumMerge(target.marginSum[r], b.marginSum[r]));
    exactSumCanonicalize(exactSumMerge(target.marginSumSq[r], b.marginSumSq[r]));
    target.marginMin[r] = Math.min(target.marginMin[r], b.marginMin[r]);
    target.marginMax[r] = Math.max(target.marginMax[r], b.marginMax[r]);
  }
  addCounts(target.marginCounts, b.marginCounts);
  if (target.envelopeSparse) throw new EngineError("INVALID_INPUT", "cannot merge into a sparse aggregate", { path: "aggregate.envelopeSparse" });
  const sp = b.envelopeSparse;
  if (sp) {
    const env = target.envelopeCounts;
    for (let k = 0; k < sp.index.length; k++) env[sp.index[k]] += sp.count[k];
  } else addCounts(target.envelopeCounts, b.envelopeCounts);
  target.failing = Array.from(new Set([...target.failing, ...b.failing])).sort((x, y) => x - y).slice(0, target.meta.failingTrialCount);
  target.sample = coalesceSegments([...target.sample, ...b.sample].sort((x, y) => x.start - y.start));
}

/**
 * Joins touching sample segments into one, so a merged aggregate has the same form whatever the
 * chunking (and canonical exact sums, see exactSumCanonicalize): its serialization is then identical too.
 */
function coalesceSegments(segments: SampleSegment[]): SampleSegment[] {
  const out: SampleSegment[] = [];
  for (const seg of segments) {
    const last = out[out.length - 1];
    if (last && last.start + last.count === seg.start) {
      const deviations = new Float64Array(last.deviations.length + seg.deviations.length);
      deviations.set(last.deviations);
      deviations.set(seg.deviations, last.deviations.length);
      const margins = new Float64Array(last.margins.length + seg.margins.length);
      margins.set(last.margins);
      margins.set(seg.margins, last.margins.length);
      out[out.length - 1] = { start: last.start, count: last.count + seg.count, deviations, margins };
    } else {
      out.push(seg);
    }
  }
  return out;
}

/**
 * Packs an aggregate into one byte buffer, so a worker can hand it over with a single transfer
 * (piscina moves only a top-level transferable). Layout: "LWA1", u32 JSON length, JSON of the plain
 * fields, padding to 8, then marginCounts (f64), sample arrays (f64), envelopeCounts (u32).
 */
export function encodeAggregate(agg: TrialAggregate): Uint8Array {
  const { marginCounts, sample, envelopeSparse: _sparse, envelopeCounts: _dense, ...plain } = agg;
  const envelopeCounts = denseEnvelope(agg);
  // Few trials fill few envelope cells: then the nonzero cells travel as (index, count) pairs.
  let nonzero = 0;
  for (let k = 0; k < envelopeCounts.length; k++) if (envelopeCounts[k] !== 0) nonzero++;
  const sparse = nonzero * 2 < envelopeCounts.length;
  const u32 = sparse ? new Uint32Array(nonzero * 2) : envelopeCounts;
  if (sparse) {
    for (let k = 0, j = 0; k < envelopeCounts.length; k++) {
      if (envelopeCounts[k] === 0) continue;
      u32[j++] = k;
      u32[j++] = envelopeCounts[k];
    }
  }
  const header = {
    ...plain, marginCountsLength: marginCounts.length, envelopeLength: envelopeCounts.length, envelopeNonzero: sparse ? nonzero : -1,
    sample: sample.map((s) => ({ start: s.start, count: s.count, dl: s.deviations.length, ml: s.margins.length })),
  };
  const json = new TextEncoder().encode(JSON.stringify(header, (_, v) => (v === Infinity ? "+inf" : v === -Infinity ? "-inf" : v)));
  const jsonEnd = 8 + json.length;
  const f64Start = Math.ceil(jsonEnd / 8) * 8;
  const f64Count = marginCounts.length + sample.reduce((n, s) => n + s.deviations.length + s.margins.length, 0);
  const u32Start = f64Start + f64Count * 8;
  const bytes = new Uint8Array(u32Start + u32.length * 4);
  const view = new DataView(bytes.buffer);
  bytes.set([76, 87, 65, 49], 0); // "LWA1"
  view.setUint32(4, json.length, true);
  bytes.set(json, 8);
  const f64 = new Float64Array(bytes.buffer, f64Start, f64Count);
  let o = 0;
  f64.set(marginCounts, o);
  o += marginCounts.length;
  for (const s of sample) {
    f64.set(s.deviations, o);
    o += s.deviations.length;
    f64.set(s.margins, o);
    o += s.margins.length;
  }
  new Uint32Array(bytes.buffer, u32Start, u32.length).set(u32);
  return bytes;
}

/** Inverse of encodeAggregate. @throws EngineError INVALID_INPUT for a buffer that is not an aggregate */
export function decodeAggregate(bytes: Uint8Array): TrialAggregate {
  if (bytes.length < 8 || bytes[0] !== 76 || bytes[1] !== 87 || bytes[2] !== 65 || bytes[3] !== 49) {
    throw new EngineError("INVALID_INPUT", "not a Lotwise trial aggregate", { path: "aggregate" });
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const jsonLength = view.getUint32(4, true);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + jsonLength)), (_, v) => (v === "+inf" ? Infinity : v === "-inf" ? -Infinity : v));
  // Copy into fresh, aligned buffers (the input may sit at any offset).
  const base = Math.ceil((8 + jsonLength) / 8) * 8;
  const f64Count = header.marginCountsLength + header.sample.reduce((n: number, s: { dl: number; ml: number }) => n + s.dl + s.ml, 0);
  const f64 = new Float64Array(bytes.slice(base, base + f64Count * 8).buffer);
  const u32Start = base + f64Count * 8;
  const nonzero: number = header.envelopeNonzero ?? -1;
  let envelopeCounts: Uint32Array;
  let envelopeSparse: TrialAggregate["envelopeSparse"];
  if (nonzero >= 0) {
    const pairs = new Uint32Array(bytes.slice(u32Start, u32Start + nonzero * 8).buffer);
    const index = new Uint32Array(nonzero);
    const count = new Uint32Array(nonzero);
    for (let k = 0; k < nonzero; k++) {
      index[k] = pairs[2 * k];
      count[k] = pairs[2 * k + 1];
    }
    envelopeCounts = new Uint32Array(0);
    envelopeSparse = { length: header.envelopeLength, index, count };
  } else {
    envelopeCounts = new Uint32Array(bytes.slice(u32Start, u32Start + header.envelopeLength * 4).buffer);
  }
  let o = 0;
  const marginCounts = f64.slice(o, o + header.marginCountsLength);
  o += header.marginCountsLength;
  const sample: SampleSegment[] = header.sample.map((s: { start: number; count: number; dl: number; ml: number }) => {
    const deviations = f64.slice(o, o + s.dl);
    o += s.dl;
    const margins = f64.slice(o, o + s.ml);
    o += s.ml;
    return { start: s.start, count: s.count, deviations, margins };
  });
  const { marginCountsLength: _m, envelopeLength: _e, envelopeNonzero: _n, sample: _s, ...plain } = header;
  return { ...plain, marginCounts, envelopeCounts, sample, ...(envelopeSparse ? { envelopeSparse } : {}) } as TrialAggregate;
}

function metaOf(plan: RunPlan): AggregateMeta {
  const o = plan.options;
  return {
    seed: o.seed,
    trialCap: o.trials,
    corners: o.corners.slice(),
    partRefs: plan.sampling.refs.slice(),
    rules: plan.rules.map(({ rule }) => {
      const r: AggregateMeta["rules"][number] = { metric: rule.metric, from: rule.from, to: rule.to, unit: rule.unit };
      if (rule.label !== undefined) r.label = rule.label;
      if (rule.min !== undefined) r.min = rule.min;
      if (rule.max !== undefined) r.max = rule.max;
      return r;
    }),
    freqs: Array.from(plan.grid.freqs),
    pairs: plan.pairs.map((p) => p.name),
    nominalMargins: Array.from(plan.nominalMargins),
    marginEdges: plan.marginEdges.map((e) => ({ ...e })),
    nominalDb: Array.from(plan.nominalDb),
    envelopeBins: plan.envelopeBins,
    envelopeBinDb: plan.envelopeBinDb,
    envelopeSpanDb: o.envelopeSpanDb,
    sensitivitySampleSize: o.sensitivitySampleSize,
    failingTrialCount: o.failingTrialCount,
  };
}

function sameRun(a: AggregateMeta, b: AggregateMeta): boolean {
  return a === b || (a.seed === b.seed && a.trialCap === b.trialCap && a.freqs.length === b.freqs.length && a.rules.length === b.rules.length &&
    a.partRefs.join("\u0000") === b.partRefs.join("\u0000") && a.envelopeBins === b.envelopeBins && a.corners.join(",") === b.corners.join(","));
}

function mergeRanges(a: [number, number][], b: [number, number][]): [number, number][] {
  const all = [...a, ...b].sort((x, y) => x[0] - y[0]);
  const out: [number, number][] = [];
  for (const [s, e] of all) {
    const last = out[out.length - 1];
    if (last && s < last[1]) throw new EngineError("INVALID_INPUT", `trial ranges overlap at trial ${s}`, { path: "aggregate.ranges" });
    if (last && s === last[1]) last[1] = e;
    else out.push([s, e]);
  }
  return out;
}
