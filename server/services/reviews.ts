import { randomUUID } from "node:crypto";
import { In } from "typeorm";
import type { AuthUser } from "../auth/sessions";
import type { AppContext } from "../context";
import { Design, DesignRevision, ReviewEvent, Run, RunComment, User } from "../entities";
import { AppError, notFound } from "../errors";
import { REVIEW_STATE_WORDS, type ReviewState } from "../../shared/contracts/vocabulary";
import type { OutgoingMail } from "../mail/mailer";
import { reviewDecidedMail, reviewRequestedMail } from "../mail/review-messages";
import { presentComment, presentReviewEvent } from "../presenters/review.presenter";
import { REVIEW_TRANSITIONS } from "../../shared/contracts/access";
import type { ReviewAction, ReviewActionInput } from "../../shared/schemas/review";

/** A revision's review steps and who takes each: shared/contracts/access.ts (the review panel offers the same). */
export { REVIEW_TRANSITIONS };

export async function listComments(ctx: AppContext, runId: string) {
  if (!(await ctx.dataSource.getRepository(Run).existsBy({ id: runId }))) throw notFound("That run");
  const comments = await ctx.dataSource.getRepository(RunComment).find({ where: { runId }, relations: { author: true }, order: { createdAt: "ASC" } });
  return comments.map(presentComment);
}

export async function addComment(ctx: AppContext, author: AuthUser, runId: string, body: string) {
  if (!(await ctx.dataSource.getRepository(Run).existsBy({ id: runId }))) throw notFound("That run");
  const repo = ctx.dataSource.getRepository(RunComment);
  const id = randomUUID();
  await repo.insert({ id, runId, authorId: author.id, body });
  return presentComment(await repo.findOneOrFail({ where: { id }, relations: { author: true } }));
}

/** The revision's review state and its history, oldest step first. */
export async function getReview(ctx: AppContext, revisionId: string) {
  const revision = await ctx.dataSource.getRepository(DesignRevision).findOneBy({ id: revisionId });
  if (!revision) throw notFound("That revision");
  const events = await ctx.dataSource.getRepository(ReviewEvent).find({ where: { revisionId }, relations: { actor: true }, order: { createdAt: "ASC" } });
  return { reviewState: revision.reviewState, events: events.map(presentReviewEvent) };
}

/**
 * Applies a review action: the action's own role (403), then the state (409 REVIEW_STATE), both checked under a
 * row lock so two reviewers cannot both decide; the step is stored as a review_event in the same transaction.
 * Afterwards mails the people involved (a mail that fails is logged; the step stands).
 */
export async function applyReviewAction(ctx: AppContext, actor: AuthUser, revisionId: string, input: ReviewActionInput) {
  const rule = REVIEW_TRANSITIONS[input.action];
  if (!actor.roles.includes(rule.role)) {
    throw new AppError("FORBIDDEN", `Only a ${rule.role} can ${rule.verb.replace(/\bit\b/, "a revision")}.`);
  }
  const comment = input.comment ?? "";
  const revision = await ctx.dataSource.transaction(async (m) => {
    const rev = await m.getRepository(DesignRevision).findOne({ where: { id: revisionId }, lock: { mode: "pessimistic_write" } });
    if (!rev) throw notFound("That revision");
    if (!rule.from.includes(rev.reviewState)) {
      const words = (state: ReviewState) => REVIEW_STATE_WORDS[state];
      throw new AppError("REVIEW_STATE", `This revision is ${words(rev.reviewState)}; to ${rule.verb} it must be ${rule.from.map(words).join(" or ")}.`);
    }
    // Submitting for sign-off freezes the revision for good (what was reviewed is what gets signed off, and what was
    // signed off is what gets built): any later change is a new revision. Returned for rework, it stays frozen too.
    await m.getRepository(DesignRevision).update({ id: rev.id }, { reviewState: rule.to, locked: true });
    await m.getRepository(ReviewEvent).insert({ id: randomUUID(), revisionId: rev.id, actorId: actor.id, fromState: rev.reviewState, toState: rule.to, comment });
    return rev;
  });
  await mailPeopleInvolved(ctx, actor, revision, input.action, comment);
  return getReview(ctx, revisionId);
}

async function mailPeopleInvolved(ctx: AppContext, actor: AuthUser, revision: DesignRevision, action: ReviewAction, comment: string): Promise<void> {
  const users = ctx.dataSource.getRepository(User);
  const design = await ctx.dataSource.getRepository(Design).findOneByOrFail({ id: revision.designId });
  const names = {
    designName: design.name,
    revisionNumber: revision.number,
    link: `${ctx.config.publicOrigin}/designs/${design.id}?revision=${encodeURIComponent(revision.id)}`,
  };
  let mails: OutgoingMail[];
  if (action === "submit") {
    const reviewers = (await users.findBy({ active: true })).filter((u) => u.roles.includes("reviewer") && u.id !== actor.id);
    mails = reviewers.map((u) => reviewRequestedMail({ ...names, to: u.email, requestedBy: actor.name, comment }));
  } else {
    const lastRequest = await ctx.dataSource.getRepository(ReviewEvent).findOne({ where: { revisionId: revision.id, toState: "awaiting-signoff" }, order: { createdAt: "DESC" } });
    const ids = [...new Set([revision.createdById, lastRequest?.actorId].filter((id): id is string => Boolean(id) && id !== actor.id))];
    const people = ids.length ? await users.findBy({ id: In(ids), active: true }) : [];
    const decision = REVIEW_TRANSITIONS[action].to as "signed-off" | "returned";
    mails = people.map((u) => reviewDecidedMail({ ...names, to: u.email, reviewer: actor.name, decision, comment }));
  }
  for (const mail of mails) {
    try {
      await ctx.mailer.send(mail);
    } catch (error) {
      ctx.log.error("mail_failed", { kind: `review_${action}`, message: (error as Error).message });
    }
  }
}
