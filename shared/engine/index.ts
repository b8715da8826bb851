/**
 * Public API of the Lotwise engine (pure TypeScript: runs in workers and in the browser).
 */
export { EngineError, isEngineError, type EngineErrorCode } from "./errors";
export type { ESeriesName, Netlist, Part, PartKind, Port } from "./netlist";
export { GROUND_NODE } from "./netlist";
export {
  compileNetlist, createSweepEvaluator, inputImpedance, nominalValues, sParamDb, sParamDeg,
  type CompiledNetlist, type SweepBuffers, type SweepEvaluator,
} from "./solver";
export { eSeriesValues, snapToSeries } from "./e-series";
export * from "./synthesis/index";

export { createTrialStream, validateSeed, MAX_INTEGER_SEED, type RunSeed, type UniformSource } from "./random";
export { compileSampling, sampleTrial, DEFAULT_LOT_CORRELATION, DEFAULT_TOLERANCE_SIGMAS, type SamplingOptions, type SamplingPlan } from "./sampling";
export { MAX_RULES, parseMetric, validateLimits, type CompiledRule, type LimitRule, type Limits, type Metric } from "./limits";
export { buildFrequencyGrid, validateSweep, MAX_POINTS, MIN_POINTS, type Band, type FrequencyGrid, type SweepSpec } from "./frequency-grid";
export { evaluateMargins, magDb, MARGIN_CLAMP, type BoundRule } from "./rules";
export { resolveRunOptions, MAX_TRIALS, MAX_CORNERS, DEFAULT_POINTS, type ResolvedRunOptions, type RunOptions } from "./run-options";
export { planRun, marginHistogramEdges, ENVELOPE_CELL_BUDGET, type PortPair, type RunPlan } from "./run-plan";
export {
  createAggregate, decodeAggregate, encodeAggregate, mergeAggregates, mergeInto,
  type AggregateMeta, type SampleSegment, type TrialAggregate,
} from "./aggregate";
export { finalizeRun, ENVELOPE_PERCENTILES, type EnvelopeSeries, type RuleSummary, type RunResult } from "./result";
export {
  createChunkRunner, driveRun, evaluateTrials, planBatches, replayTrial, runMonteCarlo, runTrialChunk, validateChunkSize, DEFAULT_CHUNK_SIZE,
  type CancelFlag, type ChunkTask, type DriveOptions, type TrialReplay,
} from "./monte-carlo";
export { deserializeEngineError, serializeEngineError, type SerializedEngineError } from "./task-errors";
export { clopperPearsonInterval, wilsonHalfWidth, wilsonInterval, type ProportionInterval } from "./stats/intervals";
export { normalCdf, normalPdf, normalQuantile, normalQuantileFast } from "./stats/normal";
export { exactSumAdd, exactSumMerge, exactSumValue, type ExactSum } from "./stats/exact-sum";
export { histogramQuantile, histogramSlot, toHistogram, type Histogram, type HistogramEdges } from "./stats/histogram";
export { midranks, pearson } from "./stats/rank-correlation";
