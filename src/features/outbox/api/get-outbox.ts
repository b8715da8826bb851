import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import type { OutboxMessage } from "@shared/contracts";
import { api } from "@/lib/api-client";
import { outboxKeys } from "@/features/outbox/api/keys";

export type { OutboxMessage };

/** Stored mail, newest first. */
export async function getOutbox(): Promise<OutboxMessage[]> {
  const { messages } = await api.get<{ messages: OutboxMessage[] }>("/outbox");
  return messages;
}

export function getOutboxQueryOptions() {
  return queryOptions({
    queryKey: outboxKeys.all,
    queryFn: getOutbox,
    staleTime: 5_000,
    refetchInterval: 10_000,
  });
}

export function useOutbox() {
  return useSuspenseQuery(getOutboxQueryOptions());
}
