/** The roles a Lotwise account can hold; one person may hold several. */
export const ROLES = ["admin", "designer", "planner", "analyst", "reviewer"] as const;

export type Role = (typeof ROLES)[number];

/** What each role is for, as shown on the Team screen. */
export const ROLE_PURPOSE: Record<Role, string> = {
  admin: "manages people, roles and invitations",
  designer: "enters filters, snaps values to E-series parts, checks the nominal response",
  planner: "sets acceptance limits, lot size and unit costs",
  analyst: "compares yield between tolerance grades and part choices",
  reviewer: "reads run history, comments, approves or sends back revisions",
};

/** True when the holder of `held` may use something open to any of `allowed`. */
export function hasAnyRole(held: readonly Role[], allowed: readonly Role[]): boolean {
  return allowed.some((role) => held.includes(role));
}
