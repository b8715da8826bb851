import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { DesignDetail } from "@/features/designs/api/types";

export function getDesign(id: string): Promise<DesignDetail> {
  return api.get<DesignDetail>(`/designs/${encodeURIComponent(id)}`);
}

export function getDesignQueryOptions(id: string) {
  return queryOptions({ queryKey: ["designs", "detail", id] as const, queryFn: () => getDesign(id) });
}

/** The design with its revisions, limit sets and measured responses. */
export function useDesign(id: string) {
  return useSuspenseQuery(getDesignQueryOptions(id));
}
