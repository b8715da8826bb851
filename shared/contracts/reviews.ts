import { z } from "zod";
import { isoInstant, personRefSchema } from "./common";
import { REVIEW_STATES } from "./vocabulary";

/** Responses of run comments and revision review. */

export const commentSchema = z.strictObject({ id: z.string(), body: z.string(), author: personRefSchema, createdAt: isoInstant });
export type Comment = z.infer<typeof commentSchema>;
export const commentsResponseSchema = z.strictObject({ comments: z.array(commentSchema) });
export const commentResponseSchema = z.strictObject({ comment: commentSchema });

export const reviewEventSchema = z.strictObject({
  id: z.string(),
  fromState: z.enum(REVIEW_STATES),
  toState: z.enum(REVIEW_STATES),
  comment: z.string().nullable(),
  actor: personRefSchema,
  createdAt: isoInstant,
});
export type ReviewEventView = z.infer<typeof reviewEventSchema>;

/** GET and POST /api/revisions/:id/review: the state and its history, oldest step first. */
export const reviewResponseSchema = z.strictObject({ reviewState: z.enum(REVIEW_STATES), events: z.array(reviewEventSchema) });
export type ReviewResponse = z.infer<typeof reviewResponseSchema>;
