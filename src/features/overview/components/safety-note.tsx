import { Alert } from "@/components/ui/alert";

/** The standing caution: an estimate is not a certification. */
export function SafetyNote() {
  return (
    <Alert tone="caution" role="note" title="Lotwise estimates; it does not certify">
      <ul className="list-disc space-y-1 pl-5">
        <li>Mains-connected filters need safety-rated capacitors (X/Y classes) and must follow local codes.</li>
        <li>
          High-power RF filters see voltage and current stress beyond the small-signal values simulated
          here; check part ratings separately.
        </li>
        <li>Measure built units. A predicted yield is no substitute for the acceptance test itself.</li>
        <li>Where they apply, defer to local codes and licensed practice.</li>
      </ul>
    </Alert>
  );
}
