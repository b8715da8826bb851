import { z } from "zod";
import { MAX_GRADE_CODE_LENGTH, REVIEW_ACTIONS, RUN_STATES } from "../contracts/vocabulary";
import { partRecord } from "./part-record";

/**
 * JSON and query shapes of run history, comments, revision review and grade sweeps (API edges).
 * Query values arrive as strings, so numbers are coerced here; every failure names its field
 * (the API answers 400 with `query.pageSize`, `body.assignments.0.label` and so on).
 */

export const HISTORY_SORTS = ["queuedAt", "finishedAt", "yield", "state", "design"] as const;
export { REVIEW_ACTIONS, type ReviewAction } from "../contracts/vocabulary";

/** Longest seed a sweep accepts: the engine's integer seeds run 0..2^31−1. */
const MAX_SEED = 2147483647;

const uuid = (what: string) => z.uuid({ message: `${what} must be an id (uuid)` });

/** `2025-03-01` (that whole day, UTC) or a full ISO date-time with offset. */
const isoDate = (endOfDay: boolean) =>
  z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}(T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2}))?$/, { message: "must be an ISO date such as 2025-03-01 or 2025-03-01T12:00:00Z" })
    .transform((s, ctx) => {
      const dateOnly = s.length === 10;
      const at = new Date(dateOnly ? `${s}T00:00:00Z` : s);
      if (Number.isNaN(at.getTime())) {
        ctx.addIssue({ code: "custom", message: "is not a real date" });
        return z.NEVER;
      }
      // "to" given as a day includes that whole day: the bound becomes the next midnight (exclusive).
      return dateOnly && endOfDay ? new Date(at.getTime() + 86_400_000) : at;
    });

const fraction = z.coerce.number({ message: "must be a number" }).min(0, { message: "must be ≥ 0" }).max(1, { message: "must be ≤ 1" });
const wholeNumber = (min: number, max: number) =>
  z.coerce.number({ message: "must be a number" }).int({ message: "must be an integer" }).min(min, { message: `must be ≥ ${min}` }).max(max, { message: `must be ≤ ${max}` });

/**
 * `GET /api/runs` filters, sorting and paging (messages name no field: the API reports them under `query.<field>`).
 * Dates bound `queuedAt`: from ≤ queuedAt < to.
 */
export const historyQuerySchema = z
  .object({
    designId: z.uuid({ message: "must be a design id (uuid)" }).optional(),
    revisionId: z.uuid({ message: "must be a revision id (uuid)" }).optional(),
    launchedBy: z.string().min(1, { message: "must not be empty" }).max(255, { message: "is at most 255 characters" }).optional(),
    /** one state or several, comma-separated: `state=done,failed` */
    state: z
      .string({ message: "must be one state or a comma-separated list" })
      .transform((s) => s.split(",").map((x) => x.trim()).filter(Boolean))
      .pipe(z.array(z.enum(RUN_STATES, { message: `must be one of ${RUN_STATES.join(", ")}` })).min(1, { message: "must name a state" }))
      .optional(),
    from: isoDate(false).optional(),
    to: isoDate(true).optional(),
    minYield: fraction.optional(),
    maxYield: fraction.optional(),
    sort: z.enum(HISTORY_SORTS, { message: `must be one of ${HISTORY_SORTS.join(", ")}` }).default("queuedAt"),
    dir: z.enum(["asc", "desc"], { message: "must be asc or desc" }).default("desc"),
    page: wholeNumber(1, 100_000).default(1),
    pageSize: wholeNumber(1, 100).default(25),
  })
  .refine((q) => q.minYield === undefined || q.maxYield === undefined || q.minYield <= q.maxYield, { message: "is greater than maxYield", path: ["minYield"] })
  .refine((q) => !q.from || !q.to || q.from < q.to, { message: "must be before to", path: ["from"] });
export type HistoryQuery = z.infer<typeof historyQuerySchema>;

/** `GET /api/runs/compare?ids=a,b,c`: 2 to 6 distinct run ids. */
export const compareQuerySchema = z.object({
  ids: z
    .string({ message: "must list 2 to 6 run ids, comma-separated" })
    .transform((s) => s.split(",").map((x) => x.trim()).filter(Boolean))
    .pipe(
      z
        .array(z.uuid({ message: "must hold run ids (uuid)" }))
        .min(2, { message: "needs at least 2 runs" })
        .max(6, { message: "takes at most 6 runs" })
        .refine((ids) => new Set(ids).size === ids.length, { message: "must not repeat a run" }),
    ),
});
export type CompareQuery = z.infer<typeof compareQuerySchema>;

export const commentBodySchema = z.strictObject({
  body: z.string({ message: "body is required" }).trim().min(1, { message: "body must not be empty" }).max(4000, { message: "body is at most 4000 characters" }),
});
export type CommentBody = z.infer<typeof commentBodySchema>;

export const reviewActionSchema = z.strictObject({
  action: z.enum(REVIEW_ACTIONS, { message: `action must be one of ${REVIEW_ACTIONS.join(", ")}` }),
  comment: z.string().trim().max(2000, { message: "comment is at most 2000 characters" }).optional(),
});
export type ReviewActionInput = z.infer<typeof reviewActionSchema>;

const assignmentSchema = z.strictObject({
  label: z.string({ message: "label is required" }).trim().min(1, { message: "label must not be empty" }).max(160, { message: "label is at most 160 characters" }),
  /** part ref → grade code of the catalogue (checked against the revision and the catalogue by the service) */
  gradeOverrides: partRecord(z.string().min(1).max(40), z.string().min(1, { message: "grade code must not be empty" }).max(MAX_GRADE_CODE_LENGTH)),
});

/** `POST /api/sweeps`: one run per assignment, all with the same seed. */
export const createSweepSchema = z.strictObject({
  revisionId: uuid("revisionId"),
  limitSetId: uuid("limitSetId"),
  trials: z.number({ message: "trials must be a number" }).int({ message: "trials must be an integer" }).min(1, { message: "trials must be ≥ 1" }).max(1_000_000, { message: "trials must be ≤ 1000000" }),
  seed: z.number({ message: "seed must be a number" }).int({ message: "seed must be an integer" }).min(0, { message: "seed must be ≥ 0" }).max(MAX_SEED, { message: `seed must be ≤ ${MAX_SEED}` }).optional(),
  targetYield: z.number({ message: "targetYield must be a number" }).gt(0, { message: "targetYield must be > 0" }).max(1, { message: "targetYield must be ≤ 1" }),
  name: z.string().trim().min(1, { message: "name must not be empty" }).max(120, { message: "name is at most 120 characters" }).optional(),
  assignments: z
    .array(assignmentSchema, { message: "assignments must be a list" })
    .min(1, { message: "a sweep needs at least 1 assignment" })
    .max(12, { message: "a sweep takes at most 12 assignments" })
    .refine((a) => new Set(a.map((x) => x.label)).size === a.length, { message: "assignment labels must differ" }),
});
export type CreateSweepInput = z.infer<typeof createSweepSchema>;
