/** Query keys of the stored mail (the outbox feature owns them). */
export const outboxKeys = {
  all: ["outbox"] as const,
};
