import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { runKeys } from "@/features/runs/api/keys";
import type { RunSummary } from "@shared/contracts";

export async function cancelRun(runId: string): Promise<RunSummary> {
  const { run } = await api.post<{ run: RunSummary }>(`/runs/${encodeURIComponent(runId)}/cancel`);
  return run;
}

/** Stops a queued or running run; 409 when it already finished. */
export function useCancelRun(runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => cancelRun(runId),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: runKeys.detail(runId) }), queryClient.invalidateQueries({ queryKey: runKeys.lists() })]),
  });
}
