import { z } from "zod";
import { isoInstant, roleSchema } from "./common";

/** Responses of the signed-in person, invitations, members and the outbox. */

/** The signed-in person, as `/api/auth/me` and sign-in answer. */
export const authUserSchema = z.strictObject({ id: z.string(), email: z.string(), name: z.string(), roles: z.array(roleSchema) });
export type AuthUserView = z.infer<typeof authUserSchema>;
export const authUserResponseSchema = z.strictObject({ user: authUserSchema });

/** An invitation as the invitee sees it before accepting. */
export const invitationPreviewSchema = z.strictObject({ email: z.string(), roles: z.array(roleSchema), expiresAt: isoInstant });
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;
export const invitationPreviewResponseSchema = z.strictObject({ invitation: invitationPreviewSchema });

export const memberSchema = z.strictObject({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
  active: z.boolean(),
  createdAt: isoInstant,
});
export type Member = z.infer<typeof memberSchema>;
export const membersResponseSchema = z.strictObject({ members: z.array(memberSchema) });
export const memberResponseSchema = z.strictObject({ member: memberSchema });

export const invitationSchema = z.strictObject({
  id: z.string(),
  email: z.string(),
  roles: z.array(roleSchema),
  createdAt: isoInstant,
  expiresAt: isoInstant,
  acceptedAt: isoInstant.nullable(),
  revokedAt: isoInstant.nullable(),
  /** the inviter's name (their id when the account is gone) */
  invitedBy: z.string(),
});
export type Invitation = z.infer<typeof invitationSchema>;
export const invitationsResponseSchema = z.strictObject({ invitations: z.array(invitationSchema) });
export const invitationResponseSchema = z.strictObject({ invitation: invitationSchema });

/** A mail the local SMTP stand-in received and stored. */
export const outboxMessageSchema = z.strictObject({
  id: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  receivedAt: isoInstant,
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
export const outboxResponseSchema = z.strictObject({ messages: z.array(outboxMessageSchema), mode: z.string() });
