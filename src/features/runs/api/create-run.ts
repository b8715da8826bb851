import { useMutation, useQueryClient, type QueryClient } from "@tanstack/react-query";
import type { Revision, RunSummary } from "@shared/contracts";
import { createRunSchema, type CreateRunInput } from "@shared/schemas/run-request";
import { api, checkBody } from "@/lib/api-client";
import { designKeys, revisionKeys } from "@/features/designs";
import { runKeys } from "@/features/runs/api/keys";

export type { CreateRunInput };

export async function createRun(input: CreateRunInput): Promise<RunSummary> {
  const { run } = await api.post<{ run: RunSummary }>("/runs", checkBody(createRunSchema, input));
  return run;
}

/**
 * What a launch changes besides the new run: the server locks the revision it runs (a later edit must become a new
 * revision), so the revision, its design's revision list and the history lists are all stale. The cached revision is
 * marked locked at once, so a screen shown from the cache before the refetch lands never offers to overwrite it.
 */
export function invalidateAfterLaunch(queryClient: QueryClient, runs: readonly Pick<RunSummary, "designId" | "revisionId">[]): Promise<unknown> {
  const work: Promise<unknown>[] = [queryClient.invalidateQueries({ queryKey: runKeys.lists() })];
  for (const { designId, revisionId } of runs) {
    queryClient.setQueryData<Revision>(revisionKeys.detail(revisionId), (r) => (r ? { ...r, locked: true } : r));
    work.push(queryClient.invalidateQueries({ queryKey: revisionKeys.detail(revisionId) }));
    work.push(queryClient.invalidateQueries({ queryKey: designKeys.detail(designId) }));
  }
  work.push(queryClient.invalidateQueries({ queryKey: designKeys.lists() }));
  return Promise.all(work);
}

/** Queues a run (designer, planner, analyst). */
export function useCreateRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRun,
    onSuccess: (run) => invalidateAfterLaunch(queryClient, [run]),
  });
}
