import type { Role } from "@shared/roles";

/** Who may launch or cancel a run (POST /api/runs): the workflow contract's roles. */
export const LAUNCH_ROLES: readonly Role[] = ["designer", "planner", "analyst"];
/** Who may launch a grade sweep. */
export const SWEEP_ROLES: readonly Role[] = ["analyst"];
