/** Query keys of the team's people and invitations (the team feature owns them). */
export const teamKeys = {
  all: ["team"] as const,
  members: () => [...teamKeys.all, "members"] as const,
  invitations: () => [...teamKeys.all, "invitations"] as const,
};
