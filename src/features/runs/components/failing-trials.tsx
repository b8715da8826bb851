import { Link } from "react-router-dom";
import { Card } from "@/components/ui/card";
import { paths } from "@/config/paths";

/** The first failing trials, each opening its replay (full response and part values from the seed). */
export function FailingTrials({ runId, trials }: { runId: string; trials: number[] }) {
  return (
    <Card title="First failing trials" description="Each is replayed from the run's seed, exactly as it was drawn.">
      {trials.length === 0 ? (
        <p className="text-sm text-pass-300">None failed.</p>
      ) : (
        <ul className="flex flex-wrap gap-2" aria-label="Failing trials">
          {trials.slice(0, 24).map((index) => (
            <li key={index}>
              <Link
                to={paths.app.runTrial.getHref(runId, index)}
                className="inline-block rounded border border-fault-500/60 px-2 py-1 font-mono text-xs text-fault-300 hover:bg-fault-900 focus-visible:outline-2 focus-visible:outline-signal-300"
              >
                trial {index}
              </Link>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
