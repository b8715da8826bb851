import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

/** Query keys of a design's limit sets (the limits feature owns them). */
export const limitSetKeys = {
  all: ["limit-sets"] as const,
  list: (designId: string) => [...limitSetKeys.all, designId] as const,
};
import type { LimitSet } from "@shared/contracts";

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
