import { randomUUID } from "node:crypto";
import { IsNull, MoreThan, type EntityManager } from "typeorm";
import { hashPassword } from "../auth/passwords";
import { createToken, hashToken, INVITATION_LIFETIME_MS, RESET_LIFETIME_MS } from "../auth/tokens";
import type { AppContext } from "../context";
import { Invitation, PasswordReset, User } from "../entities";
import { AppError } from "../errors";
import { invitationMail, passwordResetMail } from "../mail/messages";
import type { Role } from "../../shared/roles";

const invalidToken = () => new AppError("TOKEN_INVALID", "This link is not valid any more: it was used, revoked or has expired.");

/** Stores an invitation and mails its link; if the mail cannot be sent the invitation is removed again. */
export async function inviteMember(ctx: AppContext, inviter: { id: string; name: string }, email: string, roles: Role[]): Promise<Invitation> {
  const repo = ctx.dataSource.getRepository(Invitation);
  if (await ctx.dataSource.getRepository(User).existsBy({ email })) {
    throw new AppError("ALREADY_MEMBER", "That e-mail address already belongs to a member.", { fields: { email: "already a member" } });
  }
  const { token, tokenHash } = createToken();
  const invitation = repo.create({
    id: randomUUID(),
    email,
    roles,
    tokenHash,
    invitedById: inviter.id,
    expiresAt: new Date(Date.now() + INVITATION_LIFETIME_MS),
    acceptedAt: null,
    revokedAt: null,
  });
  await repo.insert(invitation);
  try {
    await ctx.mailer.send(invitationMail({ to: email, invitedBy: inviter.name, roles, expiresAt: invitation.expiresAt, link: `${ctx.config.publicOrigin}/invitation/${token}` }));
  } catch (error) {
    await repo.delete({ id: invitation.id });
    ctx.log.error("mail_failed", { kind: "invitation", message: (error as Error).message });
    throw new AppError("MAIL_FAILED", "The invitation mail could not be sent, so no invitation was stored.");
  }
  return (await repo.findOneOrFail({ where: { id: invitation.id }, relations: { invitedBy: true } }));
}

/** The open invitation behind a token, or TOKEN_INVALID. */
export async function findOpenInvitation(manager: EntityManager, token: string): Promise<Invitation> {
  const invitation = await manager.getRepository(Invitation).findOneBy({
    tokenHash: hashToken(token),
    acceptedAt: IsNull(),
    revokedAt: IsNull(),
    expiresAt: MoreThan(new Date()),
  });
  if (!invitation) throw invalidToken();
  return invitation;
}

/** Creates the account for an invitation and marks it used, in one transaction (a token works once). */
export async function acceptInvitation(ctx: AppContext, token: string, name: string, password: string): Promise<User> {
  const passwordHash = await hashPassword(password);
  return ctx.dataSource.transaction(async (manager) => {
    const invitation = await findOpenInvitation(manager, token);
    const claimed = await manager.getRepository(Invitation).update({ id: invitation.id, acceptedAt: IsNull() }, { acceptedAt: new Date() });
    if (claimed.affected !== 1) throw invalidToken();
    if (await manager.getRepository(User).existsBy({ email: invitation.email })) throw invalidToken();
    const user = manager.getRepository(User).create({ id: randomUUID(), email: invitation.email, name, passwordHash, roles: invitation.roles, active: true });
    await manager.getRepository(User).insert(user);
    return user;
  });
}

/** Mails a reset link when an active account has this address; says nothing either way. */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await ctx.dataSource.getRepository(User).findOneBy({ email, active: true });
  if (!user) return;
  const { token, tokenHash } = createToken();
  const expiresAt = new Date(Date.now() + RESET_LIFETIME_MS);
  await ctx.dataSource.getRepository(PasswordReset).insert({ id: randomUUID(), userId: user.id, tokenHash, expiresAt, usedAt: null });
  try {
    await ctx.mailer.send(passwordResetMail({ to: user.email, expiresAt, link: `${ctx.config.publicOrigin}/reset-password/${token}` }));
  } catch (error) {
    ctx.log.error("mail_failed", { kind: "password_reset", message: (error as Error).message });
  }
}

/** Sets a new password from a reset token (single use) and signs the account out everywhere. */
export async function resetPassword(ctx: AppContext, token: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  const userId = await ctx.dataSource.transaction(async (manager) => {
    const reset = await manager.getRepository(PasswordReset).findOneBy({ tokenHash: hashToken(token), usedAt: IsNull(), expiresAt: MoreThan(new Date()) });
    if (!reset) throw invalidToken();
    const claimed = await manager.getRepository(PasswordReset).update({ id: reset.id, usedAt: IsNull() }, { usedAt: new Date() });
    if (claimed.affected !== 1) throw invalidToken();
    await manager.getRepository(User).update({ id: reset.userId }, { passwordHash });
    return reset.userId;
  });
  await ctx.sessions.invalidateAllFor(userId);
}
