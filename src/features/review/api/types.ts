export type Comment = { id: string; body: string; author: { id: string; name: string }; createdAt: string };
export type ReviewState = "draft" | "in-review" | "approved" | "changes-requested";
export type ReviewAction = "request" | "approve" | "request-changes";
export type ReviewEvent = { id: string; fromState: ReviewState; toState: ReviewState; comment: string | null; actor: { id: string; name: string }; createdAt: string };
