import { Card } from "@/components/ui/card";
import type { RunResultView as RunResultJson } from "@shared/contracts";
import { paretoOption } from "@/features/runs/components/charts/bar-options";
import { LazyChart } from "@/features/runs/components/charts/lazy-chart";
import { ruleName } from "@/features/runs/utils/format";

/** Which rules the failing trials break, most first. */
export function FailurePareto({ result }: { result: RunResultJson }) {
  const rows = result.rules.map((rule) => ({ name: ruleName(rule), failures: rule.failures })).filter((r) => r.failures > 0);
  const anyFailure = rows.length > 0;
  const clean = result.rules.length - rows.length;
  return (
    <Card title="Failures by rule" description="Failing trials per rule, largest first; the line is the cumulative share.">
      {anyFailure ? (
        <>
          <LazyChart option={paretoOption(rows)} height={260} label="Failure Pareto per rule" />
          {clean > 0 && <p className="text-xs text-ink-400">{clean} other {clean === 1 ? "rule" : "rules"} never failed.</p>}
        </>
      ) : (
        <p className="text-sm text-pass-300">No trial failed any rule.</p>
      )}
    </Card>
  );
}
