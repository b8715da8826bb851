import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { isFinishedRunState, type RunResponse } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { runKeys } from "@/features/runs/api/keys";

export async function getRun(runId: string): Promise<RunResponse> {
  return api.get<RunResponse>(`/runs/${encodeURIComponent(runId)}`);
}

/** Runs whose progress stream (SSE) is open on this page: their query is not polled meanwhile; the stream's end refreshes it. */
export const liveProgressStreams = new Set<string>();

/** The stored run with its result; polled every 1.5 s while it is queued or running and no progress stream is open. */
export function getRunQueryOptions(runId: string) {
  return queryOptions({
    queryKey: runKeys.detail(runId),
    queryFn: () => getRun(runId),
    refetchInterval: (query) => {
      const state = query.state.data?.run.state;
      return state && !isFinishedRunState(state) && !liveProgressStreams.has(runId) ? 1500 : false;
    },
    staleTime: (query) => (query.state.data && isFinishedRunState(query.state.data.run.state) ? Infinity : 0),
  });
}

export function useRun(runId: string) {
  return useSuspenseQuery(getRunQueryOptions(runId));
}
