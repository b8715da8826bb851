import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { runKeys } from "@/features/runs";
import type { CompareEntry } from "@shared/contracts";

export type { CompareEntry };

/** 2 to 6 stored runs with their results, in the order asked. */
export function getCompareQueryOptions(runIds: string[]) {
  const ids = runIds.join(",");
  return queryOptions({
    queryKey: runKeys.compare(ids),
    queryFn: async () => (await api.get<{ runs: CompareEntry[] }>(`/runs/compare?ids=${encodeURIComponent(ids)}`)).runs,
  });
}

export const useCompare = (runIds: string[]) => useSuspenseQuery(getCompareQueryOptions(runIds));
