import type { Role } from "@shared/roles";

/** The signed-in person, as `GET /api/auth/me` returns them. */
export type User = {
  id: string;
  email: string;
  name: string;
  roles: Role[];
};

/** An invitation as the invitee sees it before accepting. */
export type InvitationPreview = {
  email: string;
  roles: Role[];
  expiresAt: string;
};
