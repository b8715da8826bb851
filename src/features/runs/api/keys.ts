/**
 * Query keys of the data the runs feature owns: runs, their history pages, compare views and replayed trials.
 * History, compare and sweeps read runs through these keys (the feature's index.ts), so a change to a run
 * invalidates every view of it.
 */
export const runKeys = {
  all: ["runs"] as const,
  /** history pages, keyed by their query string */
  lists: () => [...runKeys.all, "list"] as const,
  list: (queryString: string) => [...runKeys.lists(), queryString] as const,
  compares: () => [...runKeys.all, "compare"] as const,
  compare: (ids: string) => [...runKeys.compares(), ids] as const,
  details: () => [...runKeys.all, "detail"] as const,
  detail: (runId: string) => [...runKeys.details(), runId] as const,
  trial: (runId: string, index: number) => [...runKeys.all, "trial", runId, index] as const,
};
