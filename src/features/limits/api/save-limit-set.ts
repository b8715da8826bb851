import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
// TODO(lead): use api.put once src/lib/api-client.ts has it.
import { getLimitSetsQueryOptions } from "@/features/limits/api/get-limit-sets";
import type { LimitSet, LimitSetInput } from "@/features/limits/api/types";

export type SaveLimitSetInput = { designId: string; id: string | null; data: LimitSetInput };

export async function saveLimitSet({ designId, id, data }: SaveLimitSetInput): Promise<LimitSet> {
  const { limitSet } = id
    ? await api.put<{ limitSet: LimitSet }>(`/limit-sets/${encodeURIComponent(id)}`, data)
    : await api.post<{ limitSet: LimitSet }>(`/designs/${encodeURIComponent(designId)}/limit-sets`, data);
  return limitSet;
}

/** Adds (id null) or replaces a limit set (planner); 400 names `limits.rules[k].field`. */
export function useSaveLimitSet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveLimitSet,
    onSuccess: (_s, input) => {
      void queryClient.invalidateQueries({ queryKey: getLimitSetsQueryOptions(input.designId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ["designs", "detail", input.designId] });
    },
  });
}

/** Removes a limit set (planner). */
export function useDeleteLimitSet(designId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/limit-sets/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getLimitSetsQueryOptions(designId).queryKey }),
  });
}
