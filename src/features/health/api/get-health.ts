import { queryOptions, useQuery } from "@tanstack/react-query";
import type { DispatchHealth, Health } from "@shared/contracts";
import { api, ApiError } from "@/lib/api-client";
import { healthKeys } from "@/features/health/api/keys";

export type { DispatchHealth, Health };

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
    queryKey: healthKeys.all,
    queryFn: getHealth,
    refetchInterval: 60_000,
    staleTime: 30_000,
  });
}

export function useHealth() {
  return useQuery(getHealthQueryOptions());
}
