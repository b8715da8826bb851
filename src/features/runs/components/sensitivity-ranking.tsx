import { Card } from "@/components/ui/card";
import type { RunResultView as RunResultJson } from "@shared/contracts";
import { mostFailingRule, sensitivityRanking } from "@/features/runs/utils/analysis";
import { count, ruleName } from "@/features/runs/utils/format";

/** Parts ranked by |Spearman ρ| of their deviation with the margin of the most-failing rule. */
export function SensitivityRanking({ result, limit = 8 }: { result: RunResultJson; limit?: number }) {
  const r = mostFailingRule(result);
  if (r < 0) return null;
  const ranking = sensitivityRanking(result, r).slice(0, limit);
  return (
    <Card title="What drives failures" description={`Rank correlation of each part's deviation with the margin of “${ruleName(result.rules[r])}” over ${count(result.sensitivity.sampleSize)} trials.`}>
      {ranking.length === 0 ? (
        <p className="text-sm text-ink-300">No part varies, so no part drives the margin.</p>
      ) : (
        <ol className="flex flex-col gap-1.5" aria-label="Sensitivity ranking">
          {ranking.map(({ ref, rho }) => (
            <li key={ref} className="grid grid-cols-[4rem_1fr_5rem] items-center gap-3 font-mono text-sm">
              <span className="text-paper-100">{ref}</span>
              <span className="h-2.5 rounded-full bg-ink-800">
                <span className={`block h-full rounded-full ${rho < 0 ? "bg-fault-400" : "bg-pass-400"}`} style={{ width: `${Math.abs(rho) * 100}%` }} />
              </span>
              <span className="text-right text-paper-200">ρ {rho >= 0 ? "+" : "−"}{Math.abs(rho).toFixed(2)}</span>
            </li>
          ))}
        </ol>
      )}
      <p className="mt-3 text-xs text-ink-400">ρ &gt; 0: a larger value raises the margin; ρ &lt; 0: a larger value eats it.</p>
    </Card>
  );
}
