import { existsSync } from "node:fs";
import { resolve } from "node:path";
import express, { type Express } from "express";
import type { AppContext } from "./context";
import { AppError } from "./errors";
import { errorHandler } from "./middlewares/error-handler";
import { requireSameOrigin } from "./middlewares/origin";
import { securityHeaders } from "./middlewares/security-headers";
import { loadSession } from "./middlewares/session";
import type { ApiRouter, RouteInfo } from "./routes/api-router";
import { authRoutes } from "./routes/auth.routes";
import { designsRoutes } from "./routes/designs.routes";
import { limitsRoutes } from "./routes/limits.routes";
import { reviewsRoutes } from "./routes/reviews.routes";
import { runsRoutes } from "./routes/runs.routes";
import { systemRoutes } from "./routes/system.routes";
import { teamRoutes } from "./routes/team.routes";

const JSON_LIMIT = "1mb";

/**
 * The Express app: JSON API under /api (session, same-origin check, routes, errors), and the built client with a
 * fallback to index.html for client-side routes. `routes` lists every API route with its access policy.
 */
export function createApp(ctx: AppContext): { app: Express; routes: RouteInfo[] } {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", false);
  // Security headers and the content security policy on every response, API and client alike.
  app.use(securityHeaders({ production: ctx.config.env === "production" }));

  // Order matters where paths overlap: reviewsRoutes' fixed paths (/runs, /runs/compare) come before runsRoutes' /runs/:id.
  const routers: ApiRouter[] = [systemRoutes(ctx), authRoutes(ctx), teamRoutes(ctx), designsRoutes(ctx), limitsRoutes(ctx), reviewsRoutes(ctx), runsRoutes(ctx)];
  const api = express.Router();
  api.use(express.json({ limit: JSON_LIMIT }));
  api.use(requireSameOrigin(ctx.config.publicOrigin));
  api.use(loadSession(ctx.sessions));
  for (const r of routers) api.use(r.prefix || "/", r.router);
  api.use((req, _res, next) => next(new AppError("NOT_FOUND", `No API route ${req.method} ${req.baseUrl}${req.path}.`)));
  api.use(errorHandler(ctx.log));
  app.use("/api", (req, res, next) => {
    res.set("Cache-Control", "no-store");
    next();
  }, api);

  const clientDir = resolve(ctx.config.clientDir);
  if (existsSync(resolve(clientDir, "index.html"))) {
    app.use(express.static(clientDir, { index: false, maxAge: "1h" }));
    app.get("/{*splat}", (_req, res) => res.sendFile(resolve(clientDir, "index.html")));
  }
  app.use(errorHandler(ctx.log));

  return { app, routes: routers.flatMap((r) => r.routes) };
}
