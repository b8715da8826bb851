import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { RunResultJson, RunSummary } from "@/features/runs/api/types";

export type CompareEntry = { run: RunSummary; result: RunResultJson | null };

/** 2 to 6 stored runs with their results, in the order asked. */
export function getCompareQueryOptions(runIds: string[]) {
  const ids = runIds.join(",");
  return queryOptions({
    queryKey: ["runs", "compare", ids] as const,
    queryFn: async () => (await api.get<{ runs: CompareEntry[] }>(`/runs/compare?ids=${encodeURIComponent(ids)}`)).runs,
  });
}

export const useCompare = (runIds: string[]) => useSuspenseQuery(getCompareQueryOptions(runIds));
