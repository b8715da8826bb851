import { z } from "zod";
import { decoyPasswordHash, verifyPassword } from "../auth/passwords";
import type { AppContext } from "../context";
import { AppError } from "../errors";
import { presentAuthUser } from "../presenters/user.presenter";
import { acceptInvitation, findAccountByEmail, findOpenInvitation, requestPasswordReset, resetPassword } from "../services/accounts";
import { acceptInvitationSchema, requestResetSchema, resetPasswordSchema, signInSchema } from "../../shared/schemas/auth";
import { ApiRouter } from "./api-router";

const WRONG_CREDENTIALS = "E-mail or password is incorrect.";

/** Sign-in, sign-out, the current person, invitations and password resets. */
export function authRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter("/auth");

  api.get("/me", {
    access: "signed-in",
    handler: async ({ res, user }) => void res.json({ user: presentAuthUser(user!) }),
  });

  api.post("/sign-in", {
    access: "public",
    body: signInSchema,
    handler: async ({ req, res, body }) => {
      const address = req.socket.remoteAddress ?? "unknown";
      await ctx.limiter.check(body.email, address);
      const user = await findAccountByEmail(ctx, body.email);
      const ok = await verifyPassword(user?.passwordHash ?? (await decoyPasswordHash()), body.password);
      if (!user || !ok || !user.active) {
        await ctx.limiter.recordFailure(body.email, address);
        throw new AppError("INVALID_CREDENTIALS", WRONG_CREDENTIALS);
      }
      await ctx.limiter.recordSuccess(body.email);
      if (res.locals.sessionId) await ctx.sessions.invalidate(res.locals.sessionId as string);
      res.append("Set-Cookie", await ctx.sessions.create(user.id));
      res.json({ user: presentAuthUser(user) });
    },
  });

  api.post("/sign-out", {
    access: "signed-in",
    handler: async ({ res }) => {
      await ctx.sessions.invalidate(res.locals.sessionId as string);
      res.append("Set-Cookie", ctx.sessions.blankCookie());
      res.status(204).end();
    },
  });

  api.get("/invitations/:token", {
    access: "public",
    handler: async ({ req, res }) => {
      const token = z.string().min(20).max(200).safeParse(req.params.token);
      if (!token.success) throw new AppError("TOKEN_INVALID", "This link is not valid any more: it was used, revoked or has expired.", { status: 404 });
      try {
        const invitation = await findOpenInvitation(ctx.dataSource.manager, token.data);
        res.json({ invitation: { email: invitation.email, roles: invitation.roles, expiresAt: invitation.expiresAt.toISOString() } });
      } catch (error) {
        if (error instanceof AppError) throw new AppError(error.code, error.message, { status: 404 });
        throw error;
      }
    },
  });

  api.post("/accept-invitation", {
    access: "public",
    body: acceptInvitationSchema,
    handler: async ({ res, body }) => {
      const user = await acceptInvitation(ctx, body.token, body.name, body.password);
      if (res.locals.sessionId) await ctx.sessions.invalidate(res.locals.sessionId as string);
      res.append("Set-Cookie", await ctx.sessions.create(user.id));
      res.status(201).json({ user: presentAuthUser(user) });
    },
  });

  api.post("/request-reset", {
    access: "public",
    body: requestResetSchema,
    handler: async ({ req, res, body }) => {
      await ctx.limiter.consumeResetRequest(body.email, req.socket.remoteAddress ?? "unknown");
      await requestPasswordReset(ctx, body.email);
      res.status(202).json({ ok: true });
    },
  });

  api.post("/reset-password", {
    access: "public",
    body: resetPasswordSchema,
    handler: async ({ res, body }) => {
      await resetPassword(ctx, body.token, body.password);
      res.json({ ok: true });
    },
  });

  return api;
}
