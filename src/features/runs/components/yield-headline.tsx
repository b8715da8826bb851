import type { RunResultView as RunResultJson } from "@shared/contracts";
import { count, interval, percent } from "@/features/runs/utils/format";
import { cn } from "@/utils/cn";

/** Yield in large mono type with its 95 % Wilson interval, the trial counts and how the run stopped. */
export function YieldHeadline({ result, target }: { result: RunResultJson; target?: number }) {
  const tone = result.yield >= 0.99 ? "text-pass-300" : result.yield >= 0.9 ? "text-signal-300" : "text-fault-300";
  return (
    <section aria-label="Yield" className="flex flex-wrap items-end gap-x-10 gap-y-3">
      <div>
        <p className="text-xs font-semibold uppercase tracking-wide text-ink-300">Yield</p>
        <p data-testid="yield-value" className={cn("font-mono text-6xl font-bold leading-none tracking-tight", tone)}>
          {percent(result.yield, 1)}
        </p>
      </div>
      <div className="font-mono">
        <p className="text-xs font-semibold uppercase tracking-wide text-ink-300 font-sans">95 % interval (Wilson)</p>
        <p className="text-2xl text-paper-100">{interval(result.wilson95, 1)}</p>
        <p className="text-xs text-ink-300">Clopper–Pearson {interval(result.clopperPearson95, 1)}</p>
      </div>
      <div className="font-mono text-sm text-paper-200">
        <p>
          {count(result.passed)} of {count(result.trials)} trials pass
        </p>
        <p className="text-xs text-ink-300">
          {result.stop.stoppedEarly
            ? `stopped when sure: ± ${percent(result.halfWidth95, 2)} reached before the cap of ${count(result.stop.trialCap)}`
            : `± ${percent(result.halfWidth95, 2)} half-width`}
          {target !== undefined && ` · target ${percent(target, 1)}`}
        </p>
        {result.corners.length > 1 && <p className="text-xs text-ink-300">passes at every corner: {result.corners.map((c) => `${c} °C`).join(", ")}</p>}
      </div>
    </section>
  );
}
