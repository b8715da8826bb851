import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Measured } from "@/features/designs/api/types";

export async function getMeasured(id: string): Promise<Measured> {
  const { measured } = await api.get<{ measured: Measured }>(`/measured/${encodeURIComponent(id)}`);
  return measured;
}

export function getMeasuredQueryOptions(id: string) {
  return queryOptions({ queryKey: ["measured", id] as const, queryFn: () => getMeasured(id), staleTime: Infinity });
}

/** A stored measured response (|S| dB per pair) for the overlay; idle while `id` is null. */
export function useMeasured(id: string | null) {
  return useQuery({ ...getMeasuredQueryOptions(id ?? ""), enabled: id !== null });
}
