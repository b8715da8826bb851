import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import type { Comment } from "@/features/review/api/types";

export const commentSchema = z.object({ body: z.string().trim().min(1, "Write something first.").max(4000, "At most 4000 characters.") });

export function getCommentsQueryOptions(runId: string) {
  return queryOptions({
    queryKey: ["runs", "comments", runId] as const,
    queryFn: async () => (await api.get<{ comments: Comment[] }>(`/runs/${encodeURIComponent(runId)}/comments`)).comments,
  });
}

export const useComments = (runId: string) => useSuspenseQuery(getCommentsQueryOptions(runId));

/** Adds a comment to a run (any signed-in person). */
export function useAddComment(runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: string) => (await api.post<{ comment: Comment }>(`/runs/${encodeURIComponent(runId)}/comments`, { body })).comment,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getCommentsQueryOptions(runId).queryKey }),
  });
}
