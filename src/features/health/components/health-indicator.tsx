import { cn } from "@/utils/cn";
import { useHealth, type DispatchHealth } from "@/features/health/api/get-health";

/** " · 3 workers" in distributed mode ("· redis down" while Redis is away); nothing in embedded mode. */
function dispatchLabel(d: DispatchHealth | undefined): string {
  if (!d || d.mode === "embedded") return "";
  if (d.redis === "down") return " · redis down";
  return ` · ${d.workers ?? 0} worker${d.workers === 1 ? "" : "s"}`;
}

/** A one-line server and database state (and in distributed mode the worker processes), for the foot of the navigation. */
export function HealthIndicator() {
  const health = useHealth();
  const state = health.isPending
    ? { label: "checking server…", dot: "bg-ink-500" }
    : health.isError
      ? { label: "server unreachable", dot: "bg-fault-400" }
      : health.data.status === "ok"
        ? { label: `server ok · database ${health.data.database}${dispatchLabel(health.data.dispatch)}`, dot: "bg-pass-400" }
        : { label: `server degraded · database ${health.data.database}${dispatchLabel(health.data.dispatch)}`, dot: "bg-signal-400" };

  return (
    <p role="status" className="flex items-center gap-2 font-mono text-[11px] text-ink-400">
      <span aria-hidden="true" className={cn("size-2 rounded-full", state.dot)} />
      {state.label}
    </p>
  );
}
