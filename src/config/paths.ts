/**
 * Every client URL, as `{ path, getHref }`: `path` is the router pattern, `getHref` builds a link.
 * Links elsewhere in the client come only from here.
 */
export const paths = {
  auth: {
    signIn: {
      path: "/sign-in",
      getHref: (next?: string | null) =>
        next && next !== "/" ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in",
    },
    forgotPassword: {
      path: "/forgot-password",
      getHref: () => "/forgot-password",
    },
    resetPassword: {
      path: "/reset-password/:token",
      getHref: (token: string) => `/reset-password/${encodeURIComponent(token)}`,
    },
    invitation: {
      path: "/invitation/:token",
      getHref: (token: string) => `/invitation/${encodeURIComponent(token)}`,
    },
  },
  app: {
    root: {
      path: "/",
      getHref: () => "/",
    },
    overview: {
      path: "",
      getHref: () => "/",
    },
    team: {
      path: "team",
      getHref: () => "/team",
    },
    outbox: {
      path: "outbox",
      getHref: (messageId?: string) =>
        messageId ? `/outbox?message=${encodeURIComponent(messageId)}` : "/outbox",
    },
  },
} as const;

/**
 * The in-app destination named by a `?next=` parameter, or the Overview when it is missing or
 * points off-site (`//host`, `/\host`, `https://…`): sign-in must not become an open redirect.
 */
export function safeNextHref(raw: string | null | undefined): string {
  if (!raw || !raw.startsWith("/") || raw.startsWith("//") || raw.startsWith("/\\")) {
    return paths.app.root.getHref();
  }
  return raw;
}
