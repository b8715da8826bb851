import { randomUUID } from "node:crypto";
import { setTimeout as setTimeoutPromise } from "node:timers/promises";
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
  const stored = await repo.findOneOrFail({ where: { id: invitation.id }, relations: { invitedBy: true } });
  await revokeOlderInvitations(ctx.dataSource.manager, stored);
  return stored;
}

/**
 * Only the newest invitation to an address works: once its mail is out, the older open ones are revoked (an
 * earlier mail may sit in a shared or forwarded mailbox). "Older" is by (created_at, id), a total order, so two
 * invitations sent at the same moment still leave exactly one open.
 */
async function revokeOlderInvitations(manager: EntityManager, newest: Invitation): Promise<void> {
  await manager
    .createQueryBuilder()
    .update(Invitation)
    .set({ revokedAt: new Date() })
    .where("email = :email AND accepted_at IS NULL AND revoked_at IS NULL", { email: newest.email })
    .andWhere("(created_at < :createdAt OR (created_at = :createdAt AND id < :id))", { createdAt: newest.createdAt, id: newest.id })
    .execute();
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

/** The account with this e-mail address (active or not), or null: sign-in checks its password and state. */
export function findAccountByEmail(ctx: AppContext, email: string): Promise<User | null> {
  return ctx.dataSource.getRepository(User).findOneBy({ email });
}

/** Creates the account for an invitation and marks it used, in one transaction (a token works once). */
export async function acceptInvitation(ctx: AppContext, token: string, name: string, password: string): Promise<User> {
  const passwordHash = await hashPassword(password);
  return ctx.dataSource.transaction(async (manager) => {
    const invitation = await findOpenInvitation(manager, token);
    const claimed = await manager.getRepository(Invitation).update({ id: invitation.id, acceptedAt: IsNull(), revokedAt: IsNull() }, { acceptedAt: new Date() });
    if (claimed.affected !== 1) throw invalidToken();
    if (await manager.getRepository(User).existsBy({ email: invitation.email })) throw invalidToken();
    const user = manager.getRepository(User).create({ id: randomUUID(), email: invitation.email, name, passwordHash, roles: invitation.roles, active: true });
    await manager.getRepository(User).insert(user);
    return user;
  });
}

/**
 * How long every answer to a reset request takes, whether or not the address belongs to anyone. The work (look-up,
 * token, mail: about 0.1 s) runs off the response path, so the answer's time cannot tell who has an account.
 */
export const RESET_REQUEST_ANSWER_MS = 500;

/**
 * Answers a reset request after exactly {@link RESET_REQUEST_ANSWER_MS}; meanwhile, when an active account has this
 * address, a new reset link is issued (ending that person's older ones) and mailed. Says nothing either way; a
 * failure of that work is logged, never answered.
 */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const answerAt = setTimeoutPromise(RESET_REQUEST_ANSWER_MS);
  issuePasswordReset(ctx, email).catch((error: unknown) => {
    ctx.log.error("password_reset_failed", { error: (error as Error)?.name, message: (error as Error)?.message });
  });
  await answerAt;
}

async function issuePasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await ctx.dataSource.getRepository(User).findOneBy({ email, active: true });
  if (!user) return;
  const { token, tokenHash } = createToken();
  const expiresAt = new Date(Date.now() + RESET_LIFETIME_MS);
  // Requests for different people can still deadlock on the index gaps of password_reset (InnoDB then rolls one
  // back): that one is simply tried again, a few times.
  for (let attempt = 1; ; attempt++) {
    try {
      await ctx.dataSource.transaction(async (manager) => {
        // The person's row is the lock both here and in resetPassword, so two requests at once cannot both leave a live link.
        await lockUser(manager, user.id);
        await manager.getRepository(PasswordReset).delete({ userId: user.id, usedAt: IsNull() });
        await manager.getRepository(PasswordReset).insert({ id: randomUUID(), userId: user.id, tokenHash, expiresAt, usedAt: null });
      });
      break;
    } catch (error) {
      const deadlock = (error as { errno?: number; driverError?: { errno?: number } })?.driverError?.errno === 1213 || (error as { errno?: number })?.errno === 1213;
      if (!deadlock || attempt >= 5) throw error;
      await setTimeoutPromise(20 * attempt);
    }
  }
  try {
    await ctx.mailer.send(passwordResetMail({ to: user.email, expiresAt, link: `${ctx.config.publicOrigin}/reset-password/${token}` }));
  } catch (error) {
    ctx.log.error("mail_failed", { kind: "password_reset", message: (error as Error).message });
  }
}

/**
 * Sets a new password from a reset token (single use), ends every other open reset link of the person, and signs
 * the account out everywhere.
 */
export async function resetPassword(ctx: AppContext, token: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  const userId = await ctx.dataSource.transaction(async (manager) => {
    const resets = manager.getRepository(PasswordReset);
    const reset = await resets.findOneBy({ tokenHash: hashToken(token), usedAt: IsNull(), expiresAt: MoreThan(new Date()) });
    if (!reset) throw invalidToken();
    await lockUser(manager, reset.userId);
    const claimed = await resets.update({ id: reset.id, usedAt: IsNull() }, { usedAt: new Date() });
    if (claimed.affected !== 1) throw invalidToken();
    await resets.delete({ userId: reset.userId, usedAt: IsNull() });
    await manager.getRepository(User).update({ id: reset.userId }, { passwordHash });
    return reset.userId;
  });
  await ctx.sessions.invalidateAllFor(userId);
}

/** SELECT … FOR UPDATE on the person's row, held until the transaction ends. */
async function lockUser(manager: EntityManager, userId: string): Promise<void> {
  await manager.getRepository(User).findOne({ where: { id: userId }, lock: { mode: "pessimistic_write" } });
}
