import type { AppContext } from "../context";
import { OutboxMessage } from "../entities";
import { presentOutboxMessage } from "../presenters/user.presenter";
import { ApiRouter } from "./api-router";

/** Health (public, for monitoring) and the local mail stand-in's outbox (admin, development and demo only). */
export function systemRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();

  api.get("/health", {
    access: "public",
    handler: async ({ res }) => {
      const up = await Promise.race([
        ctx.dataSource.query("SELECT 1").then(() => true, () => false),
        new Promise<boolean>((resolve) => setTimeout(() => resolve(false), 2000).unref()),
      ]);
      res.status(up ? 200 : 503).json({ status: up ? "ok" : "degraded", database: up ? "up" : "down" });
    },
  });

  api.get("/outbox", {
    access: ["admin"],
    handler: async ({ res }) => {
      const messages = await ctx.dataSource.getRepository(OutboxMessage).find({ order: { receivedAt: "DESC" }, take: 200 });
      res.json({ messages: messages.map(presentOutboxMessage), mode: ctx.mailer.mode });
    },
  });

  return api;
}
