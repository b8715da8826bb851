import { useState } from "react";
import { mayTakeReviewAction, type ReviewAction, type Role } from "@shared/contracts";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { useReview, useReviewAction } from "@/features/review/api/review";
import { ReviewStateBadge } from "@/features/review/components/review-state-badge";
import { formatDateTime } from "@/utils/format";

/**
 * The revision's review: its state and trail, and the moves the signed-in person may make —
 * a designer submits it for sign-off (draft or returned), a reviewer signs it off or returns it for rework.
 */
export function ReviewPanel({ revisionId, revisionNumber, roles }: { revisionId: string; revisionNumber: number | null; roles: readonly Role[] }) {
  const review = useReview(revisionId);
  const act = useReviewAction(revisionId);
  const [comment, setComment] = useState("");
  const state = review.data.reviewState;
  const canRequest = mayTakeReviewAction(roles, "submit", state);
  const canDecide = mayTakeReviewAction(roles, "sign-off", state);
  const run = (action: ReviewAction) => act.mutate({ action, comment: comment.trim() || undefined }, { onSuccess: () => setComment("") });

  return (
    <div className="flex flex-col gap-4">
      <p className="flex items-center gap-2 text-sm text-paper-200">
        Revision {revisionNumber === null ? "" : `r${revisionNumber} `}is <ReviewStateBadge state={state} />
      </p>
      {review.data.events.length > 0 && (
        <ol className="flex flex-col gap-1.5 border-l border-ink-700 pl-4 text-sm" aria-label="Sign-off trail">
          {review.data.events.map((e) => (
            <li key={e.id}>
              <span className="font-semibold text-paper-100">{e.actor.name}</span>{" "}
              <span className="text-ink-300">moved it to</span> <ReviewStateBadge state={e.toState} />{" "}
              <span className="text-xs text-ink-400">{formatDateTime(e.createdAt)}</span>
              {e.comment && <p className="text-paper-200">“{e.comment}”</p>}
            </li>
          ))}
        </ol>
      )}
      {(canRequest || canDecide) && (
        <div className="flex flex-col gap-2">
          <label htmlFor="review-note" className="text-sm font-semibold text-paper-200">
            Note with the decision (optional)
          </label>
          <textarea id="review-note" rows={2} value={comment} onChange={(e) => setComment(e.target.value)}
            className="rounded-md border border-ink-600 bg-ink-950 px-3 py-2 text-sm text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400" />
          <div className="flex flex-wrap gap-2">
            {canRequest && <Button pending={act.isPending} onClick={() => run("submit")}>Submit for sign-off</Button>}
            {canDecide && <Button pending={act.isPending} onClick={() => run("sign-off")}>Sign off revision</Button>}
            {canDecide && <Button variant="danger" pending={act.isPending} onClick={() => run("return")}>Return for rework</Button>}
          </div>
        </div>
      )}
      {!canRequest && !canDecide && (
        <p className="text-xs text-ink-400">
          {state === "awaiting-signoff" ? "A reviewer signs this revision off or returns it." : state === "signed-off" ? "Signed off; a change needs a new revision." : "The designer submits it for sign-off when ready."}
        </p>
      )}
      {act.isError && <Alert tone="error">{act.error.message}</Alert>}
    </div>
  );
}
