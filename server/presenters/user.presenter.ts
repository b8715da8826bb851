import type { AuthUser } from "../auth/sessions";
import type { Invitation, OutboxMessage, User } from "../entities";
import type { AuthUserView, Invitation as InvitationView, Member, OutboxMessage as OutboxMessageView } from "../../shared/contracts";

/** The signed-in person, as `/api/auth/me` shows them. */
export const presentAuthUser = (u: Pick<AuthUser, "id" | "email" | "name" | "roles">): AuthUserView => ({ id: u.id, email: u.email, name: u.name, roles: u.roles });

export const presentMember = (u: User): Member => ({
  id: u.id,
  email: u.email,
  name: u.name,
  roles: u.roles,
  active: u.active,
  createdAt: u.createdAt.toISOString(),
});

export const presentInvitation = (i: Invitation & { invitedBy?: User }): InvitationView => ({
  id: i.id,
  email: i.email,
  roles: i.roles,
  createdAt: i.createdAt.toISOString(),
  expiresAt: i.expiresAt.toISOString(),
  acceptedAt: i.acceptedAt?.toISOString() ?? null,
  revokedAt: i.revokedAt?.toISOString() ?? null,
  invitedBy: i.invitedBy?.name ?? i.invitedById,
});

export const presentOutboxMessage = (m: OutboxMessage): OutboxMessageView => ({
  id: m.id,
  from: m.from,
  to: m.to,
  subject: m.subject,
  text: m.text,
  receivedAt: m.receivedAt.toISOString(),
});
