import { Badge } from "@/components/ui/badge";
import type { ReviewState } from "@/features/review/api/types";

const tone = { draft: "muted", "in-review": "signal", approved: "pass", "changes-requested": "fault" } as const;
const words: Record<ReviewState, string> = { draft: "draft", "in-review": "in review", approved: "approved", "changes-requested": "changes requested" };

/** The review state of a revision as a small tag. */
export function ReviewStateBadge({ state }: { state: ReviewState }) {
  return <Badge tone={tone[state] ?? "neutral"}>{words[state] ?? state}</Badge>;
}
