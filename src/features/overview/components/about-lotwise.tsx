import { Card } from "@/components/ui/card";

const STEPS = [
  {
    label: "Netlist",
    text: "A filter revision: R, L and C parts with nominal values, E-series, tolerance grade and parasitics, between two or more ports.",
  },
  {
    label: "Limits",
    text: "The acceptance rules the test station applies: |S21| and |S11| bands, ripple, group delay, the −3 dB corner.",
  },
  {
    label: "Monte Carlo",
    text: "Thousands of seeded trials draw part values within tolerance and solve the nodal equations at every frequency point.",
  },
  {
    label: "Yield",
    text: "How many built units would pass, with a confidence interval, the parts that drive failures and the cost per good unit.",
  },
];

/** A short account of what Lotwise computes. */
export function AboutLotwise() {
  return (
    <Card title="What Lotwise does">
      <p className="text-sm leading-relaxed text-paper-200">
        Lotwise tells a hardware team, before parts are ordered, how many of its built LC filters will
        pass their acceptance test given real component tolerances, and what to change when too few would.
        Any trial can be replayed exactly from its seed.
      </p>
      <ol className="mt-4 grid gap-3 md:grid-cols-4">
        {STEPS.map((step, index) => (
          <li key={step.label} className="rounded-md border border-ink-700 bg-ink-950/60 px-4 py-3">
            <p className="flex items-baseline gap-2">
              <span className="font-mono text-xs text-ink-400">{String(index + 1).padStart(2, "0")}</span>
              <span className="text-sm font-semibold text-paper-50">{step.label}</span>
            </p>
            <p className="mt-1 text-xs leading-relaxed text-ink-300">{step.text}</p>
          </li>
        ))}
      </ol>
      <p className="mt-4 text-xs text-ink-400">
        Design workspaces, limit sets and runs open here as they become ready.
      </p>
    </Card>
  );
}
