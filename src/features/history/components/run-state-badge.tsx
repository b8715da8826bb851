import { Badge } from "@/components/ui/badge";
import type { RunState } from "@shared/contracts";

const tone = { queued: "muted", running: "signal", done: "pass", failed: "fault", cancelled: "neutral" } as const;

/** A run's state as a small tag. */
export function RunStateBadge({ state }: { state: RunState }) {
  return <Badge tone={tone[state] ?? "neutral"}>{state}</Badge>;
}
