import { Link } from "react-router-dom";
import { paths } from "@/config/paths";
import type { RunDetail } from "@shared/contracts";
import { count } from "@/features/runs/utils/format";
import { formatDateTime } from "@/utils/format";

/** The inputs that make the run reproducible: revision, trials, seed, corners, overrides, who and when. */
export function RunFacts({ run }: { run: RunDetail }) {
  const overrides = Object.entries(run.gradeOverrides ?? {});
  const facts: [string, React.ReactNode][] = [
    ["design", <Link key="d" className="text-signal-300 underline" to={paths.app.design.getHref(run.designId, run.revisionId)}>{run.designName} r{run.revisionNumber}</Link>],
    ["trials", `${count(run.trialsDone)} / ${count(run.trialsTotal)}`],
    ["seed", String(run.seed)],
    ["corners", run.options.corners?.length ? run.options.corners.map((c) => `${c} °C`).join(", ") : "25 °C"],
    ["stop when sure", run.options.targetHalfWidth ? `± ${(run.options.targetHalfWidth * 100).toFixed(2)} %` : "off"],
    ["grades", overrides.length ? overrides.map(([ref, code]) => `${ref}→${code}`).join(", ") : "as entered"],
    ["launched", `${run.launchedBy.name}, ${formatDateTime(run.queuedAt)}`],
  ];
  // A server stop interrupted the run; it ran again from its seed, so the numbers are those of an uninterrupted run.
  if (run.interruptions > 0) {
    facts.push(["interrupted", `${run.interruptions}× (last ${run.lastInterruptedAt ? formatDateTime(run.lastInterruptedAt) : "—"}), resumed from its seed`]);
  }
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm md:grid-cols-4">
      {facts.map(([term, value]) => (
        <div key={term}>
          <dt className="text-xs uppercase tracking-wide text-ink-300">{term}</dt>
          <dd className="font-mono text-paper-100">{value}</dd>
        </div>
      ))}
    </dl>
  );
}
