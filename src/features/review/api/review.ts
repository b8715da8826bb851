import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { ReviewAction, ReviewEvent, ReviewState } from "@/features/review/api/types";

export function getReviewQueryOptions(revisionId: string) {
  return queryOptions({
    queryKey: ["revisions", "review", revisionId] as const,
    queryFn: () => api.get<{ reviewState: ReviewState; events: ReviewEvent[] }>(`/revisions/${encodeURIComponent(revisionId)}/review`),
  });
}

export const useReview = (revisionId: string) => useSuspenseQuery(getReviewQueryOptions(revisionId));

/** Moves the revision's review: request (designer), approve / request changes (reviewer only); 409 REVIEW_STATE. */
export function useReviewAction(revisionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { action: ReviewAction; comment?: string }) =>
      api.post<{ reviewState: ReviewState }>(`/revisions/${encodeURIComponent(revisionId)}/review`, input),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: getReviewQueryOptions(revisionId).queryKey }),
        queryClient.invalidateQueries({ queryKey: ["revisions", "detail", revisionId] }),
        queryClient.invalidateQueries({ queryKey: ["designs"] }),
      ]),
  });
}
