import { Badge } from "@/components/ui/badge";
import { REVIEW_STATE_TONE, REVIEW_STATE_WORDS, type ReviewState } from "@shared/contracts";

/** The review state of a revision as a small tag. */
export function ReviewStateBadge({ state }: { state: ReviewState }) {
  return <Badge tone={REVIEW_STATE_TONE[state] ?? "neutral"}>{REVIEW_STATE_WORDS[state] ?? state}</Badge>;
}
