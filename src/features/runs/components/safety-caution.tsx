import { Alert } from "@/components/ui/alert";
import type { StressClass as Stress } from "@shared/contracts";

/**
 * Lotwise estimates; it does not certify. The caution is always shown beside a result, and spelled out
 * in the fault tone when the design is mains-connected or carries high RF power.
 */
export function SafetyCaution({ stress }: { stress: Stress | undefined }) {
  if (stress === "mains" || stress === "high-power-rf") {
    return (
      <Alert tone="error" role="note" title={stress === "mains" ? "Mains-connected filter: this is an estimate, not a certification" : "High-power RF filter: this is an estimate, not a certification"}>
        <ul className="list-disc space-y-1 pl-5">
          {stress === "mains" ? (
            <li>Use safety-rated capacitors (X/Y classes) across and to earth, and follow the local electrical codes.</li>
          ) : (
            <li>Parts see voltage and current stress beyond the small-signal values simulated here: check ratings, heating and arcing separately.</li>
          )}
          <li>Lotwise estimates yield from tolerances; measure built units on the acceptance test before release.</li>
          <li>Defer to local codes and licensed practice.</li>
        </ul>
      </Alert>
    );
  }
  return (
    <Alert tone="caution" role="note">
      Lotwise estimates; it does not certify. Yield here comes from the part tolerances and the limits as entered: measure built units before release.
    </Alert>
  );
}
