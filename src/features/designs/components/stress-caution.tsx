import { Alert } from "@/components/ui/alert";
import type { StressClass } from "@shared/contracts";

const TEXT: Partial<Record<StressClass, { title: string; body: string }>> = {
  mains: {
    title: "Mains-connected filter",
    body: "Lotwise models small-signal behaviour only. Safety capacitors (X/Y class), creepage and clearance, surge and leakage-current limits are not checked here; follow the applicable safety standard and have the build inspected.",
  },
  "high-power-rf": {
    title: "High-power RF filter",
    body: "Lotwise does not model voltage and current stress, self-heating or arcing. Check each part's rated voltage, current and dissipation at the real drive level before building.",
  },
};

/** The safety caution for mains-connected and high-power designs; nothing for small-signal ones. */
export function StressCaution({ stress }: { stress: StressClass }) {
  const text = TEXT[stress];
  if (!text) return null;
  return (
    <Alert tone="caution" role="note" title={text.title}>
      {text.body} Lotwise estimates; it does not certify: measure built units and defer to local codes and licensed practice.
    </Alert>
  );
}
