import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

export type Health = { status: "ok" | "degraded"; database: "up" | "down" };

export async function getHealth(): Promise<Health> {
  return api.get<Health>("/health");
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
