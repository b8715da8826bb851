import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { runKeys } from "@/features/runs/api/keys";
import type { TrialReplay } from "@shared/contracts";

export async function getTrial(runId: string, index: number): Promise<TrialReplay> {
  const { trial } = await api.get<{ trial: TrialReplay }>(`/runs/${encodeURIComponent(runId)}/trials/${index}`);
  return trial;
}

/** A trial replayed from the run's seed; it never changes, so it is never stale. */
export function getTrialQueryOptions(runId: string, index: number) {
  return queryOptions({ queryKey: runKeys.trial(runId, index), queryFn: () => getTrial(runId, index), staleTime: Infinity });
}

export function useTrial(runId: string, index: number) {
  return useSuspenseQuery(getTrialQueryOptions(runId, index));
}
