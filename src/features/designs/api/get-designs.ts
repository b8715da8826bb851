import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Design } from "@/features/designs/api/types";

export async function getDesigns(archived: boolean): Promise<Design[]> {
  const { designs } = await api.get<{ designs: Design[] }>(`/designs?archived=${archived}`);
  return designs;
}

export function getDesignsQueryOptions(archived = false) {
  return queryOptions({ queryKey: ["designs", { archived }] as const, queryFn: () => getDesigns(archived) });
}

export function useDesigns(archived = false) {
  return useSuspenseQuery(getDesignsQueryOptions(archived));
}
