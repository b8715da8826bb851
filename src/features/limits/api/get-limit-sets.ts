import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { LimitSet } from "@/features/limits/api/types";

export async function getLimitSets(designId: string): Promise<LimitSet[]> {
  const { limitSets } = await api.get<{ limitSets: LimitSet[] }>(`/designs/${encodeURIComponent(designId)}/limit-sets`);
  return limitSets;
}

export function getLimitSetsQueryOptions(designId: string) {
  return queryOptions({ queryKey: ["limit-sets", designId] as const, queryFn: () => getLimitSets(designId) });
}

/** A design's limit sets with their rules. */
export function useLimitSets(designId: string) {
  return useSuspenseQuery(getLimitSetsQueryOptions(designId));
}
