import { hasAnyRole, ROLES, ROLE_PURPOSE, type Role } from "../roles";
import type { ReviewAction, ReviewState } from "./vocabulary";

export { hasAnyRole, ROLES, ROLE_PURPOSE, type Role };

/**
 * Who may do what: the role lists the server's routes declare and the client's screens use to show or hide an
 * action. A route open to every signed-in person is not listed here.
 */
export const ACCESS = {
  /** create, edit and archive designs and revisions; delete measured responses */
  editDesigns: ["designer"],
  /** upload a measured response to overlay */
  uploadMeasured: ["designer", "analyst"],
  /** edit limit sets and the grade catalogue */
  editLimits: ["planner"],
  /** launch a run (POST /api/runs) or cancel one */
  launchRuns: ["designer", "planner", "analyst"],
  /** launch a grade sweep */
  launchSweeps: ["analyst"],
  /** reach the review route at all; each action's own role is REVIEW_ACTION_ROLE */
  reviewRevisions: ["designer", "reviewer"],
  /** people, roles, invitations, compute limits, the outbox */
  administer: ["admin"],
} as const satisfies Record<string, readonly Role[]>;

/**
 * A revision's sign-off: draft → awaiting-signoff (a designer submits it) → signed-off | returned (only a reviewer
 * decides); returned → awaiting-signoff again when the designer submits anew. Signed off is final for that
 * revision (changes go into a new revision). The server enforces it; the review panel offers only what it allows.
 */
export const REVIEW_TRANSITIONS: Record<ReviewAction, { role: Role; from: readonly ReviewState[]; to: ReviewState; verb: string }> = {
  submit: { role: "designer", from: ["draft", "returned"], to: "awaiting-signoff", verb: "submit it for sign-off" },
  "sign-off": { role: "reviewer", from: ["awaiting-signoff"], to: "signed-off", verb: "sign it off" },
  return: { role: "reviewer", from: ["awaiting-signoff"], to: "returned", verb: "return it for rework" },
};

/** True when a holder of `roles` may take `action` on a revision in `state`. */
export function mayTakeReviewAction(roles: readonly Role[], action: ReviewAction, state: ReviewState): boolean {
  const rule = REVIEW_TRANSITIONS[action];
  return roles.includes(rule.role) && rule.from.includes(state);
}
