/** Query keys of the admin's settings (the settings feature owns them). */
export const settingsKeys = {
  computeLimits: ["settings", "compute-limits"] as const,
};
