import { queryOptions, useQuery } from "@tanstack/react-query";
import { api, ApiError } from "@/lib/api-client";

/** Where runs are computed: the server's own threads, or worker processes through Redis (distributed mode). */
export type DispatchHealth =
  | { mode: "embedded"; threads: number }
  | { mode: "distributed"; redis: "up" | "down"; workers: number | null; waitingChunks: number | null; activeChunks: number | null };

export type Health = { status: "ok" | "degraded"; database: "up" | "down"; dispatch?: DispatchHealth };

/** The server answers 503 with the same body when degraded (database or Redis down): that is a state, not an error. */
export async function getHealth(): Promise<Health> {
  try {
    return await api.get<Health>("/health");
  } catch (err) {
    if (err instanceof ApiError && err.status === 503) {
      const res = await fetch("/api/health", { credentials: "same-origin" });
      return (await res.json()) as Health;
    }
    throw err;
  }
}

export function getHealthQueryOptions() {
  return queryOptions({
    queryKey: ["health"] as const,
    queryFn: getHealth,
    refetchInterval: 60_000,
    staleTime: 30_000,
  });
}

export function useHealth() {
  return useQuery(getHealthQueryOptions());
}
