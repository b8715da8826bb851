import type { Role } from "@shared/roles";

export type Member = {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  active: boolean;
  createdAt: string;
};

export type Invitation = {
  id: string;
  email: string;
  roles: Role[];
  createdAt: string;
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
  invitedBy: string;
};
