import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import type { DesignDetail } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { designKeys } from "@/features/designs/api/keys";

export function getDesign(id: string): Promise<DesignDetail> {
  return api.get<DesignDetail>(`/designs/${encodeURIComponent(id)}`);
}

export function getDesignQueryOptions(id: string) {
  return queryOptions({ queryKey: designKeys.detail(id), queryFn: () => getDesign(id) });
}

/** The design with its revisions, limit sets and measured responses. */
export function useDesign(id: string) {
  return useSuspenseQuery(getDesignQueryOptions(id));
}

/** Non-suspending, idle while `id` is null (pickers render while it loads). */
export function useDesignIfAny(id: string | null) {
  return useQuery({ ...getDesignQueryOptions(id ?? ""), enabled: Boolean(id) });
}
