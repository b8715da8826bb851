import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import type { ReviewResponse } from "@shared/contracts";
import { reviewActionSchema, type ReviewActionInput } from "@shared/schemas/review";
import { api, checkBody } from "@/lib/api-client";
import { designKeys, revisionKeys } from "@/features/designs";
import { reviewKeys } from "@/features/review/api/keys";

export function getReviewQueryOptions(revisionId: string) {
  return queryOptions({
    queryKey: reviewKeys.detail(revisionId),
    queryFn: () => api.get<ReviewResponse>(`/revisions/${encodeURIComponent(revisionId)}/review`),
  });
}

export const useReview = (revisionId: string) => useSuspenseQuery(getReviewQueryOptions(revisionId));

/** Moves the revision's review: request (designer), approve / request changes (reviewer only); 409 REVIEW_STATE. */
export function useReviewAction(revisionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ReviewActionInput) => api.post<ReviewResponse>(`/revisions/${encodeURIComponent(revisionId)}/review`, checkBody(reviewActionSchema, input)),
    onSuccess: () =>
      Promise.all([
        // the revision (now frozen) and its review, then its design's revision list and the designs table
        queryClient.invalidateQueries({ queryKey: revisionKeys.detail(revisionId) }),
        queryClient.invalidateQueries({ queryKey: designKeys.all }),
      ]),
  });
}
