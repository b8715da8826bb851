import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import type { LimitSet } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { limitSetKeys } from "@/features/limits/api/keys";

export async function getLimitSets(designId: string): Promise<LimitSet[]> {
  const { limitSets } = await api.get<{ limitSets: LimitSet[] }>(`/designs/${encodeURIComponent(designId)}/limit-sets`);
  return limitSets;
}

export function getLimitSetsQueryOptions(designId: string) {
  return queryOptions({ queryKey: limitSetKeys.list(designId), queryFn: () => getLimitSets(designId) });
}

/** A design's limit sets with their rules. */
export function useLimitSets(designId: string) {
  return useSuspenseQuery(getLimitSetsQueryOptions(designId));
}
