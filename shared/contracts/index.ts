import type { z } from "zod";
import { acceptInvitationSchema, requestResetSchema, resetPasswordSchema, signInSchema } from "../schemas/auth";
import {
  createDesignSchema,
  gradeBodySchema,
  limitSetBodySchema,
  listDesignsQuerySchema,
  measuredUploadFieldsSchema,
  replaceRevisionSchema,
  revisionBodySchema,
  revisionUploadFieldsSchema,
  updateDesignSchema,
} from "../schemas/design";
import { commentBodySchema, compareQuerySchema, createSweepSchema, historyQuerySchema, reviewActionSchema } from "../schemas/review";
import { createRunSchema } from "../schemas/run-request";
import { computeLimitsSchema } from "../schemas/settings";
import { createInvitationSchema, updateMemberSchema } from "../schemas/team";
import { okSchema } from "./common";
import {
  createdDesignResponseSchema,
  designDetailSchema,
  designResponseSchema,
  designsResponseSchema,
  gradeResponseSchema,
  gradesResponseSchema,
  limitSetResponseSchema,
  limitSetsResponseSchema,
  measuredResponseSchema,
  revisionResponseSchema,
  uploadedMeasuredResponseSchema,
} from "./designs";
import { commentResponseSchema, commentsResponseSchema, reviewResponseSchema } from "./reviews";
import {
  compareResponseSchema,
  createdSweepResponseSchema,
  runPageSchema,
  runResponseSchema,
  runSummaryResponseSchema,
  sweepResponseSchema,
  trialReplayResponseSchema,
} from "./runs";
import { computeLimitsResponseSchema, healthSchema } from "./system";
import {
  authUserResponseSchema,
  invitationPreviewResponseSchema,
  invitationResponseSchema,
  invitationsResponseSchema,
  memberResponseSchema,
  membersResponseSchema,
  outboxResponseSchema,
} from "./team";

export * from "./access";
export * from "./common";
export * from "./designs";
export * from "./reviews";
export * from "./runs";
export * from "./system";
export * from "./team";
export * from "./vocabulary";

/**
 * One endpoint's contract: what it takes (the same zod objects the server validates with and the client's forms
 * check before sending) and what it answers. `response: null` is a 204 without a body; an upload's `fields` are
 * its multipart text fields.
 */
export interface EndpointContract {
  body?: z.ZodType;
  query?: z.ZodType;
  fields?: z.ZodType;
  response: z.ZodType | null;
}

/**
 * Every JSON endpoint of /api, keyed "method /path" as the server's route table names it. Routes that answer
 * something other than JSON (CSV, Touchstone, server-sent events) are listed in NON_JSON_ENDPOINTS.
 */
export const CONTRACTS = {
  // auth
  "get /auth/me": { response: authUserResponseSchema },
  "post /auth/sign-in": { body: signInSchema, response: authUserResponseSchema },
  "post /auth/sign-out": { response: null },
  "get /auth/invitations/:token": { response: invitationPreviewResponseSchema },
  "post /auth/accept-invitation": { body: acceptInvitationSchema, response: authUserResponseSchema },
  "post /auth/request-reset": { body: requestResetSchema, response: okSchema },
  "post /auth/reset-password": { body: resetPasswordSchema, response: okSchema },
  // team
  "get /team/members": { response: membersResponseSchema },
  "patch /team/members/:id": { body: updateMemberSchema, response: memberResponseSchema },
  "get /team/invitations": { response: invitationsResponseSchema },
  "post /team/invitations": { body: createInvitationSchema, response: invitationResponseSchema },
  "delete /team/invitations/:id": { response: null },
  // system
  "get /health": { response: healthSchema },
  "get /settings/compute-limits": { response: computeLimitsResponseSchema },
  "put /settings/compute-limits": { body: computeLimitsSchema, response: computeLimitsResponseSchema },
  "get /outbox": { response: outboxResponseSchema },
  // designs
  "get /designs": { query: listDesignsQuerySchema, response: designsResponseSchema },
  "post /designs": { body: createDesignSchema, response: createdDesignResponseSchema },
  "get /designs/:id": { response: designDetailSchema },
  "patch /designs/:id": { body: updateDesignSchema, response: designResponseSchema },
  "get /revisions/:id": { response: revisionResponseSchema },
  "post /designs/:id/revisions": { body: revisionBodySchema, response: revisionResponseSchema },
  "put /revisions/:id": { body: replaceRevisionSchema, response: revisionResponseSchema },
  "post /designs/:id/revisions/upload": { fields: revisionUploadFieldsSchema, response: revisionResponseSchema },
  "post /designs/:id/measured": { fields: measuredUploadFieldsSchema, response: uploadedMeasuredResponseSchema },
  "get /measured/:id": { response: measuredResponseSchema },
  "delete /measured/:id": { response: null },
  // limit sets and grades
  "get /designs/:id/limit-sets": { response: limitSetsResponseSchema },
  "post /designs/:id/limit-sets": { body: limitSetBodySchema, response: limitSetResponseSchema },
  "put /limit-sets/:id": { body: limitSetBodySchema, response: limitSetResponseSchema },
  "delete /limit-sets/:id": { response: null },
  "get /grades": { response: gradesResponseSchema },
  "post /grades": { body: gradeBodySchema, response: gradeResponseSchema },
  "put /grades/:id": { body: gradeBodySchema, response: gradeResponseSchema },
  "delete /grades/:id": { response: null },
  // runs
  "post /runs": { body: createRunSchema, response: runSummaryResponseSchema },
  "get /runs": { query: historyQuerySchema, response: runPageSchema },
  "get /runs/compare": { query: compareQuerySchema, response: compareResponseSchema },
  "get /runs/:id": { response: runResponseSchema },
  "post /runs/:id/cancel": { response: runSummaryResponseSchema },
  "get /runs/:id/trials/:index": { response: trialReplayResponseSchema },
  "get /runs/:id/comments": { response: commentsResponseSchema },
  "post /runs/:id/comments": { body: commentBodySchema, response: commentResponseSchema },
  // review and sweeps
  "get /revisions/:id/review": { response: reviewResponseSchema },
  "post /revisions/:id/review": { body: reviewActionSchema, response: reviewResponseSchema },
  "post /sweeps": { body: createSweepSchema, response: createdSweepResponseSchema },
  "get /sweeps/:id": { response: sweepResponseSchema },
} as const satisfies Record<string, EndpointContract>;

export type Endpoint = keyof typeof CONTRACTS;

/** The endpoint's answer, as the client reads it (204 endpoints: undefined). */
export type ResponseOf<E extends Endpoint> = (typeof CONTRACTS)[E]["response"] extends z.ZodType<infer T> ? T : undefined;

/** Routes whose answer is not JSON: a file download or an event stream (their content type is checked instead). */
export const NON_JSON_ENDPOINTS = {
  "get /runs/:id/events": "text/event-stream",
  "get /runs/:id/trials.csv": "text/csv",
  "get /runs/:id/nominal.s2p": "application/octet-stream",
  "get /runs/:id/trials/:index.s2p": "application/octet-stream",
} as const;
