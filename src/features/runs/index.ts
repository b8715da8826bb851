/**
 * What other features (history, compare, sweeps) may use of the runs feature: the run query keys, what a launch
 * invalidates, the launch pickers and input checks, the figure formats and the charts of a run. Anything else in
 * this folder is the feature's own; a boundary lint rule keeps it so.
 */
export { runKeys } from "@/features/runs/api/keys";
export { invalidateAfterLaunch } from "@/features/runs/api/create-run";
export { TargetPicker, type RunTarget } from "@/features/runs/components/target-picker";
export { checkInteger, randomSeed } from "@/features/runs/utils/launch-input";
export { count, fixed, interval, money, percent, ruleName } from "@/features/runs/utils/format";
export { overlaidHistogramOption } from "@/features/runs/components/charts/bar-options";
export { LazyChart } from "@/features/runs/components/charts/lazy-chart";
export { envelopeOf } from "@/features/runs/utils/analysis";
export { maskOf, percentileRow } from "@/features/runs/utils/chart-props";
