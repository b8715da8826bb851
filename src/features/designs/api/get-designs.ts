import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import type { DesignView } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { designKeys } from "@/features/designs/api/keys";

export async function getDesigns(archived: boolean): Promise<DesignView[]> {
  const { designs } = await api.get<{ designs: DesignView[] }>(`/designs?archived=${archived}`);
  return designs;
}

export function getDesignsQueryOptions(archived = false) {
  return queryOptions({ queryKey: designKeys.list(archived), queryFn: () => getDesigns(archived) });
}

export function useDesigns(archived = false) {
  return useSuspenseQuery(getDesignsQueryOptions(archived));
}
