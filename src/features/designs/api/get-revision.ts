import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Revision } from "@/features/designs/api/types";

export async function getRevision(id: string): Promise<Revision> {
  const { revision } = await api.get<{ revision: Revision }>(`/revisions/${encodeURIComponent(id)}`);
  return revision;
}

export function getRevisionQueryOptions(id: string) {
  return queryOptions({ queryKey: ["revisions", id] as const, queryFn: () => getRevision(id) });
}

/** One revision with its netlist and sweep. */
export function useRevision(id: string) {
  return useSuspenseQuery(getRevisionQueryOptions(id));
}
