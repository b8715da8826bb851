import type { GradeSweep, ReviewEvent, RunComment, User } from "../entities";
import type { Comment, PersonRef, ReviewEventView, SweepHead, SweepView } from "../../shared/contracts";

/** Who did something, as the client shows them. */
const person = (u: User | undefined, id: string): PersonRef => ({ id, name: u?.name ?? "(removed)" });

export const presentComment = (c: RunComment & { author?: User }): Comment => ({
  id: c.id,
  body: c.body,
  author: person(c.author, c.authorId),
  createdAt: c.createdAt.toISOString(),
});

export const presentReviewEvent = (e: ReviewEvent & { actor?: User }): ReviewEventView => ({
  id: e.id,
  fromState: e.fromState,
  toState: e.toState,
  comment: e.comment,
  actor: person(e.actor, e.actorId),
  createdAt: e.createdAt.toISOString(),
});

export const presentSweepHead = (s: GradeSweep): SweepHead => ({ id: s.id, name: s.name, targetYield: s.targetYield });

export const presentSweep = (s: GradeSweep): SweepView => ({
  id: s.id,
  name: s.name,
  designId: s.designId,
  revisionId: s.revisionId,
  targetYield: s.targetYield,
  createdAt: s.createdAt.toISOString(),
});


