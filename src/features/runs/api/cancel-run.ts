import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { getRunQueryOptions } from "@/features/runs/api/get-run";
import type { RunSummary } from "@/features/runs/api/types";

export async function cancelRun(runId: string): Promise<RunSummary> {
  const { run } = await api.post<{ run: RunSummary }>(`/runs/${encodeURIComponent(runId)}/cancel`);
  return run;
}

/** Stops a queued or running run; 409 when it already finished. */
export function useCancelRun(runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => cancelRun(runId),
    onSettled: () => queryClient.invalidateQueries({ queryKey: getRunQueryOptions(runId).queryKey }),
  });
}
