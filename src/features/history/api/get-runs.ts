import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { isFinishedRunState, type RunPage } from "@shared/contracts";
import type { HISTORY_SORTS } from "@shared/schemas/review";
import { api } from "@/lib/api-client";
import { runKeys } from "@/features/runs";

export type { RunPage };

/** Filters, sort and page of GET /api/runs; every field is the query parameter of the same name. */
export type RunQuery = {
  designId?: string;
  revisionId?: string;
  launchedBy?: string;
  state?: string;
  from?: string;
  to?: string;
  minYield?: string;
  maxYield?: string;
  sort?: (typeof HISTORY_SORTS)[number];
  dir?: "asc" | "desc";
  page?: string;
  pageSize?: string;
};

export const RUN_QUERY_KEYS = ["designId", "revisionId", "launchedBy", "state", "from", "to", "minYield", "maxYield", "sort", "dir", "page", "pageSize"] as const;

/** The query string for a RunQuery, empty fields left out, in a stable order (it is also the cache key). */
export function runQueryString(query: RunQuery): string {
  const q = new URLSearchParams();
  for (const key of RUN_QUERY_KEYS) {
    const v = query[key];
    if (v) q.set(key, v);
  }
  return q.toString();
}

export function getRunsQueryOptions(query: RunQuery) {
  const qs = runQueryString(query);
  return queryOptions({
    queryKey: runKeys.list(qs),
    queryFn: () => api.get<RunPage>(`/runs${qs ? `?${qs}` : ""}`),
    placeholderData: keepPreviousData,
    // Unfinished runs in view move on by themselves: refresh the page every 3 s while any is queued or running.
    refetchInterval: (q) => (q.state.data?.runs.some((r) => !isFinishedRunState(r.state)) ? 3000 : false),
  });
}

/** Not suspending, so filters stay responsive while the next page loads (the previous page stays shown). */
export const useRuns = (query: RunQuery) => useQuery(getRunsQueryOptions(query));
