import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import type { Revision } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { revisionKeys } from "@/features/designs/api/keys";

export async function getRevision(id: string): Promise<Revision> {
  const { revision } = await api.get<{ revision: Revision }>(`/revisions/${encodeURIComponent(id)}`);
  return revision;
}

/** One revision with its netlist and sweep: one key per revision, whichever screen reads it. */
export function getRevisionQueryOptions(id: string) {
  return queryOptions({ queryKey: revisionKeys.detail(id), queryFn: () => getRevision(id) });
}

export function useRevision(id: string) {
  return useSuspenseQuery(getRevisionQueryOptions(id));
}

/** Non-suspending, idle while `id` is null (the launch pickers render while the revision loads). */
export function useRevisionIfAny(id: string | null) {
  return useQuery({ ...getRevisionQueryOptions(id ?? ""), enabled: Boolean(id) });
}
