import type { AppContext } from "../context";
import { databaseAnswers, latestOutbox } from "../services/system";
import { presentOutboxMessage } from "../presenters/user.presenter";
import { runLimits, saveRunLimits } from "../services/run-limits";
import { computeLimitsSchema, DEFAULT_COMPUTE_LIMITS } from "../../shared/schemas/settings";
import { ApiRouter } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";

/** Health (public, for monitoring) and the local mail stand-in's outbox (admin, development and demo only). */
export function systemRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();

  api.get("/health", {
    access: "public",
    handler: async ({ res }) => {
      const timeout = <T>(value: T) => new Promise<T>((resolve) => setTimeout(() => resolve(value), 2000).unref());
      const [up, dispatch] = await Promise.all([
        databaseAnswers(ctx),
        // Where runs are computed; absent until the first run started the dispatcher (embedded pool or Redis).
        Promise.race([ctx.runQueue.dispatchStatus(), timeout({ mode: "distributed", redis: "down", workers: null, waitingChunks: null, activeChunks: null } as const)]),
      ]);
      const ok = up && !(dispatch?.mode === "distributed" && dispatch.redis === "down");
      res.status(ok ? 200 : 503).json({ status: ok ? "ok" : "degraded", database: up ? "up" : "down", ...(dispatch ? { dispatch } : {}) });
    },
  });

  // Compute limits (what one run or export may cost): everyone reads them (the launch form shows them), the admin sets them.
  api.get("/settings/compute-limits", {
    access: "signed-in",
    handler: async ({ res }) => {
      res.json({ limits: await runLimits(ctx), defaults: DEFAULT_COMPUTE_LIMITS });
    },
  });

  api.put("/settings/compute-limits", {
    access: ACCESS.administer,
    body: computeLimitsSchema,
    handler: async ({ res, body, user }) => {
      res.json({ limits: await saveRunLimits(ctx, user!.id, body), defaults: DEFAULT_COMPUTE_LIMITS });
    },
  });

  api.get("/outbox", {
    access: ACCESS.administer,
    handler: async ({ res }) => {
      const messages = await latestOutbox(ctx);
      res.json({ messages: messages.map(presentOutboxMessage), mode: ctx.mailer.mode });
    },
  });

  return api;
}
