import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

/** A mail the local SMTP stand-in received and stored. */
export type OutboxMessage = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
};

/** Stored mail, newest first. */
export async function getOutbox(): Promise<OutboxMessage[]> {
  const { messages } = await api.get<{ messages: OutboxMessage[] }>("/outbox");
  return messages;
}

export function getOutboxQueryOptions() {
  return queryOptions({
    queryKey: ["outbox"] as const,
    queryFn: getOutbox,
    staleTime: 5_000,
    refetchInterval: 10_000,
  });
}

export function useOutbox() {
  return useSuspenseQuery(getOutboxQueryOptions());
}
