import { z } from "zod";
import type { AppContext } from "../context";
import { presentSweep, presentSweepHead } from "../presenters/review.presenter";
import { compareRuns, listRuns } from "../services/history";
import { addComment, applyReviewAction, getReview, listComments } from "../services/reviews";
import { createSweep, getSweep } from "../services/sweeps";
import {
  commentBodySchema,
  compareQuerySchema,
  createSweepSchema,
  historyQuerySchema,
  reviewActionSchema,
  type CommentBody,
  type CreateSweepInput,
  type ReviewActionInput,
} from "../../shared/schemas/review";
import { ApiRouter, parseInput } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";

/** Validates a query string so that failures are reported as `query.<field>` (e.g. `query.pageSize`). */
function parseQuery<T>(schema: z.ZodType<T>, query: unknown): T {
  return parseInput(z.object({ query: schema }), { query }, "query").query;
}

/**
 * Run history, compare, run comments, revision review and grade sweeps. Registered before the runs router, so
 * the fixed paths /runs and /runs/compare are matched here before /runs/:id there.
 */
export function reviewsRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();

  api.get("/runs", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json(await listRuns(ctx, parseQuery(historyQuerySchema, req.query)));
    },
  });

  api.get("/runs/compare", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json(await compareRuns(ctx, parseQuery(compareQuerySchema, req.query).ids));
    },
  });

  api.get("/runs/:id/comments", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json({ comments: await listComments(ctx, String(req.params.id)) });
    },
  });

  api.post<CommentBody>("/runs/:id/comments", {
    access: "signed-in",
    body: commentBodySchema,
    handler: async ({ req, res, body, user }) => {
      res.status(201).json({ comment: await addComment(ctx, user!, String(req.params.id), body.body) });
    },
  });

  api.get("/revisions/:id/review", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json(await getReview(ctx, String(req.params.id)));
    },
  });

  // Route access lets both roles in; the action's own role is checked by the service ("sign-off" by a designer → 403).
  api.post<ReviewActionInput>("/revisions/:id/review", {
    access: ACCESS.reviewRevisions,
    body: reviewActionSchema,
    handler: async ({ req, res, body, user }) => {
      res.json(await applyReviewAction(ctx, user!, String(req.params.id), body));
    },
  });

  api.post<CreateSweepInput>("/sweeps", {
    access: ACCESS.launchSweeps,
    body: createSweepSchema,
    handler: async ({ res, body, user }) => {
      const { sweep, runs } = await createSweep(ctx, user!, body);
      res.status(201).json({ sweep: presentSweepHead(sweep), runs });
    },
  });

  api.get("/sweeps/:id", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const { sweep, rows, cheapestMeetingTarget } = await getSweep(ctx, String(req.params.id));
      res.json({ sweep: presentSweep(sweep), rows, cheapestMeetingTarget });
    },
  });

  return api;
}
