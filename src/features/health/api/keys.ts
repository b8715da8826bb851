/** Query keys of the server's health (the health feature owns it). */
export const healthKeys = {
  all: ["health"] as const,
};
