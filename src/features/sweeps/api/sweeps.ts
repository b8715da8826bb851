import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { isFinishedRunState, type CreatedSweepResponse, type SweepResponse, type SweepRow } from "@shared/contracts";
import { createSweepSchema, type CreateSweepInput } from "@shared/schemas/review";
import { api, checkBody } from "@/lib/api-client";
import { invalidateAfterLaunch } from "@/features/runs";
import { sweepKeys } from "@/features/sweeps/api/keys";

export type { CreateSweepInput, SweepResponse, SweepRow };
export type Assignment = CreateSweepInput["assignments"][number];

/** Launches one run per grade assignment, all with the same seed (analyst); like any launch it locks the revision. */
export function useCreateSweep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateSweepInput) => api.post<CreatedSweepResponse>("/sweeps", checkBody(createSweepSchema, input)),
    onSuccess: (created) => invalidateAfterLaunch(queryClient, created.runs),
  });
}

/** The sweep's table; polled every 2 s until every run has finished. */
export function getSweepQueryOptions(sweepId: string) {
  return queryOptions({
    queryKey: sweepKeys.detail(sweepId),
    queryFn: () => api.get<SweepResponse>(`/sweeps/${encodeURIComponent(sweepId)}`),
    refetchInterval: (q) => (q.state.data?.rows.some((r) => !isFinishedRunState(r.state)) ? 2000 : false),
  });
}

export const useSweep = (sweepId: string) => useSuspenseQuery(getSweepQueryOptions(sweepId));
