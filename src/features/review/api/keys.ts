import { revisionKeys } from "@/features/designs";

/** Query keys of the data the review feature owns (reviews and run comments): every query and invalidation of it takes its key from here. */

/** A revision's review hangs off the revision's own key: invalidating the revision refreshes its review too. */
export const reviewKeys = {
  detail: (revisionId: string) => [...revisionKeys.detail(revisionId), "review"] as const,
};

/** Query keys of run comments (the review feature owns them). */
export const commentKeys = {
  all: ["comments"] as const,
  list: (runId: string) => [...commentKeys.all, runId] as const,
};
