import { queryOptions, useMutation, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { RunState, RunSummary } from "@/features/runs/api/types";

export type Assignment = { label: string; gradeOverrides: Record<string, string> };
export type CreateSweepInput = { revisionId: string; limitSetId: string; trials: number; seed?: number; targetYield: number; name?: string; assignments: Assignment[] };
export type SweepRow = { runId: string; label: string; state: RunState; yield: number | null; wilson95: [number, number] | null; bomCost: number | null; costPerGoodUnit: number | null; meetsTarget: boolean };
export type SweepResponse = {
  sweep: { id: string; name: string; designId: string; revisionId: string; targetYield: number; createdAt: string };
  rows: SweepRow[];
  cheapestMeetingTarget: string | null;
};

/** Launches one run per grade assignment, all with the same seed (analyst). */
export function useCreateSweep() {
  return useMutation({
    mutationFn: (input: CreateSweepInput) => api.post<{ sweep: { id: string; name: string; targetYield: number }; runs: RunSummary[] }>("/sweeps", input),
  });
}

/** The sweep's table; polled every 2 s until every run has finished. */
export function getSweepQueryOptions(sweepId: string) {
  return queryOptions({
    queryKey: ["sweeps", sweepId] as const,
    queryFn: () => api.get<SweepResponse>(`/sweeps/${encodeURIComponent(sweepId)}`),
    refetchInterval: (q) => (q.state.data?.rows.some((r) => r.state === "queued" || r.state === "running") ? 2000 : false),
  });
}

export const useSweep = (sweepId: string) => useSuspenseQuery(getSweepQueryOptions(sweepId));
