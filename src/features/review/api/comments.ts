import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { commentBodySchema } from "@shared/schemas/review";
import { api, checkBody } from "@/lib/api-client";
import type { Comment } from "@shared/contracts";
import { commentKeys } from "@/features/review/api/keys";

export { commentBodySchema as commentSchema } from "@shared/schemas/review";

export function getCommentsQueryOptions(runId: string) {
  return queryOptions({
    queryKey: commentKeys.list(runId),
    queryFn: async () => (await api.get<{ comments: Comment[] }>(`/runs/${encodeURIComponent(runId)}/comments`)).comments,
  });
}

export const useComments = (runId: string) => useSuspenseQuery(getCommentsQueryOptions(runId));

/** Adds a comment to a run (any signed-in person). */
export function useAddComment(runId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: string) => (await api.post<{ comment: Comment }>(`/runs/${encodeURIComponent(runId)}/comments`, checkBody(commentBodySchema, { body }))).comment,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: commentKeys.list(runId) }),
  });
}
