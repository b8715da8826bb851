/**
 * People, roles and invitations (the admin's Team screen): the data side of server/routes/team.routes.ts.
 */
import { IsNull } from "typeorm";
import type { AppContext } from "../context";
import { Invitation, User } from "../entities";
import { AppError, notFound } from "../errors";
import type { UpdateMemberInput } from "../../shared/schemas/team";

export function listMembers(ctx: AppContext): Promise<User[]> {
  return ctx.dataSource.getRepository(User).find({ order: { name: "ASC" } });
}

/**
 * Changes a member's name, roles or active state; ends their sessions on deactivation or any role change.
 * @throws AppError 404, 409 LAST_ADMIN when no active admin would remain
 */
export async function updateMember(ctx: AppContext, id: string, changes: UpdateMemberInput): Promise<User> {
  const users = ctx.dataSource.getRepository(User);
  const member = await users.findOneBy({ id });
  if (!member) throw notFound("That member");
  const next = { ...member, ...definedOnly(changes) };
  const losesAdmin = member.active && member.roles.includes("admin") && (!next.active || !next.roles.includes("admin"));
  if (losesAdmin && (await countActiveAdmins(ctx)) <= 1) {
    throw new AppError("LAST_ADMIN", "Lotwise needs at least one active admin; make someone else admin first.");
  }
  await users.update({ id: member.id }, { name: next.name, roles: next.roles, active: next.active });
  if (!next.active || changes.roles) await ctx.sessions.invalidateAllFor(member.id);
  return users.findOneByOrFail({ id: member.id });
}

export function listInvitations(ctx: AppContext): Promise<Invitation[]> {
  return ctx.dataSource.getRepository(Invitation).find({ order: { createdAt: "DESC" }, relations: { invitedBy: true }, take: 200 });
}

/** Revokes an open invitation. @throws AppError 404 when there is no open one with that id */
export async function revokeInvitation(ctx: AppContext, id: string): Promise<void> {
  const result = await ctx.dataSource.getRepository(Invitation).update({ id, acceptedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() });
  if (result.affected !== 1) throw notFound("An open invitation with that id");
}

async function countActiveAdmins(ctx: AppContext): Promise<number> {
  const active = await ctx.dataSource.getRepository(User).findBy({ active: true });
  return active.filter((u) => u.roles.includes("admin")).length;
}

function definedOnly<T extends object>(value: T): Partial<T> {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as Partial<T>;
}
