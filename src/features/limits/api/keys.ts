/** Query keys of a design's limit sets (the limits feature owns them). */
export const limitSetKeys = {
  all: ["limit-sets"] as const,
  list: (designId: string) => [...limitSetKeys.all, designId] as const,
};
