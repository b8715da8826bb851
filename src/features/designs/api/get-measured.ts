import { queryOptions, useQuery } from "@tanstack/react-query";
import type { Measured } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { measuredKeys } from "@/features/designs/api/keys";

export async function getMeasured(id: string): Promise<Measured> {
  const { measured } = await api.get<{ measured: Measured }>(`/measured/${encodeURIComponent(id)}`);
  return measured;
}

export function getMeasuredQueryOptions(id: string) {
  return queryOptions({ queryKey: measuredKeys.detail(id), queryFn: () => getMeasured(id), staleTime: Infinity });
}

/** A stored measured response (|S| dB per pair) for the overlay; idle while `id` is null. */
export function useMeasured(id: string | null) {
  return useQuery({ ...getMeasuredQueryOptions(id ?? ""), enabled: id !== null });
}
