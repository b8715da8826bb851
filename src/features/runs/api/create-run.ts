import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { RunSummary } from "@/features/runs/api/types";

/** Body of POST /api/runs (workflow contract). */
export type CreateRunInput = {
  revisionId: string;
  limitSetId: string;
  trials: number;
  seed?: number;
  targetHalfWidth?: number;
  corners?: number[];
  gradeOverrides?: Record<string, string>;
  toleranceOverrides?: Record<string, { tolerance?: number; toleranceAbs?: number }>;
  label?: string;
};

export async function createRun(input: CreateRunInput): Promise<RunSummary> {
  const { run } = await api.post<{ run: RunSummary }>("/runs", input);
  return run;
}

/** Queues a run; the history lists go stale. */
export function useCreateRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRun,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["runs", "list"] }),
  });
}
