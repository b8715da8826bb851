/**
 * Query keys of the data the designs feature owns: designs, their revisions and measured responses. Every query and
 * every invalidation of this data, in any feature, takes its key from here (through the feature's index.ts).
 */
export const designKeys = {
  all: ["designs"] as const,
  lists: () => [...designKeys.all, "list"] as const,
  list: (archived: boolean) => [...designKeys.lists(), { archived }] as const,
  details: () => [...designKeys.all, "detail"] as const,
  detail: (designId: string) => [...designKeys.details(), designId] as const,
};

/** A revision's own key; what hangs off one revision (its review) starts with it, so invalidating it refreshes both. */
export const revisionKeys = {
  all: ["revisions"] as const,
  detail: (revisionId: string) => [...revisionKeys.all, revisionId] as const,
};

export const measuredKeys = {
  all: ["measured"] as const,
  detail: (measuredId: string) => [...measuredKeys.all, measuredId] as const,
};
