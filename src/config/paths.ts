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
    designs: {
      path: "designs",
      getHref: () => "/designs",
    },
    newDesign: {
      path: "designs/new",
      getHref: () => "/designs/new",
    },
    design: {
      path: "designs/:designId",
      getHref: (designId: string, revisionId?: string) =>
        revisionId ? `/designs/${designId}?revision=${encodeURIComponent(revisionId)}` : `/designs/${designId}`,
    },
    designLimits: {
      path: "designs/:designId/limits",
      getHref: (designId: string, limitSetId?: string) =>
        limitSetId ? `/designs/${designId}/limits?set=${encodeURIComponent(limitSetId)}` : `/designs/${designId}/limits`,
    },
    grades: {
      path: "grades",
      getHref: () => "/grades",
    },
    runs: {
      path: "runs",
      getHref: (query?: Record<string, string>) => (query && Object.keys(query).length ? `/runs?${new URLSearchParams(query)}` : "/runs"),
    },
    newRun: {
      path: "runs/new",
      getHref: (query?: { revision?: string; limitSet?: string; design?: string }) => {
        const q = new URLSearchParams(Object.entries(query ?? {}).filter((e): e is [string, string] => Boolean(e[1])));
        return q.size ? `/runs/new?${q}` : "/runs/new";
      },
    },
    run: {
      path: "runs/:runId",
      getHref: (runId: string) => `/runs/${runId}`,
    },
    runTrial: {
      path: "runs/:runId/trials/:index",
      getHref: (runId: string, index: number) => `/runs/${runId}/trials/${index}`,
    },
    runReport: {
      path: "runs/:runId/report",
      getHref: (runId: string) => `/runs/${runId}/report`,
    },
    compare: {
      path: "compare",
      getHref: (runIds: string[] = []) => (runIds.length ? `/compare?runs=${runIds.map(encodeURIComponent).join(",")}` : "/compare"),
    },
    newSweep: {
      path: "sweeps/new",
      getHref: (query?: { revision?: string; limitSet?: string }) => {
        const q = new URLSearchParams(Object.entries(query ?? {}).filter((e): e is [string, string] => Boolean(e[1])));
        return q.size ? `/sweeps/new?${q}` : "/sweeps/new";
      },
    },
    sweep: {
      path: "sweeps/:sweepId",
      getHref: (sweepId: string) => `/sweeps/${sweepId}`,
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
