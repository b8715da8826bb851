import { z } from "zod";
import { computeLimitsSchema } from "../schemas/settings";

/** Responses of health and compute limits. */

/** Where runs are computed: the server's own threads, or worker processes through Redis (distributed mode). */
export const dispatchHealthSchema = z.discriminatedUnion("mode", [
  z.strictObject({ mode: z.literal("embedded"), threads: z.number().int() }),
  z.strictObject({
    mode: z.literal("distributed"),
    redis: z.enum(["up", "down"]),
    workers: z.number().int().nullable(),
    waitingChunks: z.number().int().nullable(),
    activeChunks: z.number().int().nullable(),
  }),
]);
export type DispatchHealth = z.infer<typeof dispatchHealthSchema>;

/** GET /api/health (503 with the same body when degraded). */
export const healthSchema = z.strictObject({ status: z.enum(["ok", "degraded"]), database: z.enum(["up", "down"]), dispatch: dispatchHealthSchema.optional() });
export type Health = z.infer<typeof healthSchema>;

export const computeLimitsResponseSchema = z.strictObject({ limits: computeLimitsSchema, defaults: computeLimitsSchema });
export type ComputeLimitsResponse = z.infer<typeof computeLimitsResponseSchema>;
