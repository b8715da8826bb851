import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { useCancelRun } from "@/features/runs/api/cancel-run";
import type { RunSummary } from "@shared/contracts";
import { useRunProgress } from "@/features/runs/hooks/use-run-progress";
import { count, duration } from "@/features/runs/utils/format";

/** Trials done of the total, rate and time left, fed by server-sent events (polling as a fallback); cancel. */
export function RunProgressPanel({ run, canCancel }: { run: RunSummary; canCancel: boolean }) {
  const progress = useRunProgress(run);
  const cancel = useCancelRun(run.id);
  const fraction = progress.trialsTotal > 0 ? Math.min(1, progress.trialsDone / progress.trialsTotal) : 0;
  const queued = progress.state === "queued";

  return (
    <section aria-label="Run progress" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex items-center gap-2">
          <Badge tone="signal">{progress.state}</Badge>
          <span className="text-sm text-ink-300">{queued ? "Waiting for a free slot; queued runs start oldest first." : "Running trials in the worker pool."}</span>
        </div>
        {canCancel && (
          <Button variant="danger" size="sm" pending={cancel.isPending} onClick={() => cancel.mutate()}>
            Cancel run
          </Button>
        )}
      </div>
      <div
        role="progressbar"
        aria-label="Trials done"
        aria-valuemin={0}
        aria-valuemax={progress.trialsTotal}
        aria-valuenow={progress.trialsDone}
        className="h-3 w-full overflow-hidden rounded-full border border-ink-700 bg-ink-950"
      >
        <div className="h-full bg-signal-500 transition-[width] duration-500" style={{ width: `${(fraction * 100).toFixed(1)}%` }} />
      </div>
      <dl className="grid grid-cols-2 gap-3 font-mono text-sm sm:grid-cols-4">
        <Fact term="trials done" value={`${count(progress.trialsDone)} / ${count(progress.trialsTotal)}`} />
        <Fact term="done" value={`${(fraction * 100).toFixed(1)} %`} />
        <Fact term="rate" value={progress.ratePerSecond ? `${count(progress.ratePerSecond)} trials/s` : "—"} />
        <Fact term="time left" value={queued ? "—" : duration(progress.etaSeconds)} />
      </dl>
      <p className="text-xs text-ink-400">{progress.live ? "Live from the server." : "Checking every 1.5 s."}</p>
      {cancel.isError && <Alert tone="error">{cancel.error.message}</Alert>}
    </section>
  );
}

function Fact({ term, value }: { term: string; value: string }) {
  return (
    <div>
      <dt className="font-sans text-xs uppercase tracking-wide text-ink-300">{term}</dt>
      <dd className="text-paper-100">{value}</dd>
    </div>
  );
}
