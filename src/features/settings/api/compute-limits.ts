import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import type { ComputeLimitsResponse } from "@shared/contracts";
import { computeLimitsSchema, type ComputeLimits } from "@shared/schemas/settings";
import { api, checkBody } from "@/lib/api-client";
import { settingsKeys } from "@/features/settings/api/keys";

export { computeLimitsSchema } from "@shared/schemas/settings";

type LimitsResponse = ComputeLimitsResponse;

export function getComputeLimitsQueryOptions() {
  return queryOptions({ queryKey: settingsKeys.computeLimits, queryFn: () => api.get<LimitsResponse>("/settings/compute-limits") });
}

export const useComputeLimits = () => useSuspenseQuery(getComputeLimitsQueryOptions());

/** Admin: sets what one run or one export may cost; the new limits apply to the next request. */
export function useSaveComputeLimits() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (limits: ComputeLimits) => api.put<LimitsResponse>("/settings/compute-limits", checkBody(computeLimitsSchema, limits)),
    onSuccess: (data) => queryClient.setQueryData(settingsKeys.computeLimits, data),
  });
}
