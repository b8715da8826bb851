import { useMutation, useQueryClient } from "@tanstack/react-query";
import { limitSetBodySchema } from "@shared/schemas/design";
import { api, checkBody } from "@/lib/api-client";
import { designKeys } from "@/features/designs";
import { limitSetKeys } from "@/features/limits/api/keys";
import type { LimitSet } from "@shared/contracts";
import type { LimitSetBodyInput as LimitSetInput } from "@shared/schemas/design";

export type SaveLimitSetInput = { designId: string; id: string | null; data: LimitSetInput };

export async function saveLimitSet({ designId, id, data }: SaveLimitSetInput): Promise<LimitSet> {
  const { limitSet } = id
    ? await api.put<{ limitSet: LimitSet }>(`/limit-sets/${encodeURIComponent(id)}`, checkBody(limitSetBodySchema, data))
    : await api.post<{ limitSet: LimitSet }>(`/designs/${encodeURIComponent(designId)}/limit-sets`, checkBody(limitSetBodySchema, data));
  return limitSet;
}

/** Adds (id null) or replaces a limit set (planner); 400 names `limits.rules[k].field`. */
export function useSaveLimitSet() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveLimitSet,
    onSuccess: (_s, input) => {
      void queryClient.invalidateQueries({ queryKey: limitSetKeys.list(input.designId) });
      void queryClient.invalidateQueries({ queryKey: designKeys.detail(input.designId) });
    },
  });
}

/** Removes a limit set (planner). */
export function useDeleteLimitSet(designId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/limit-sets/${encodeURIComponent(id)}`),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: limitSetKeys.list(designId) }), queryClient.invalidateQueries({ queryKey: designKeys.detail(designId) })]),
  });
}
