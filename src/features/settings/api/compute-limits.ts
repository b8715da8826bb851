import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import type { ComputeLimits } from "@shared/schemas/settings";
import { api } from "@/lib/api-client";

export { computeLimitsSchema } from "@shared/schemas/settings";

type LimitsResponse = { limits: ComputeLimits; defaults: ComputeLimits };

export function getComputeLimitsQueryOptions() {
  return queryOptions({ queryKey: ["settings", "compute-limits"] as const, queryFn: () => api.get<LimitsResponse>("/settings/compute-limits") });
}

export const useComputeLimits = () => useSuspenseQuery(getComputeLimitsQueryOptions());

/** Admin: sets what one run or one export may cost; the new limits apply to the next request. */
export function useSaveComputeLimits() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (limits: ComputeLimits) => api.put<LimitsResponse>("/settings/compute-limits", limits),
    onSuccess: (data) => queryClient.setQueryData(getComputeLimitsQueryOptions().queryKey, data),
  });
}
