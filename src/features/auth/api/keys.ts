/** Query keys of the session and of what a visitor reads before signing in (the auth feature owns them). */
export const authKeys = {
  me: ["auth", "me"] as const,
  invitation: (token: string) => ["invitation-preview", token] as const,
};
