import { Foundation1764633600000 } from "./1764633600000-foundation";
import { Workflow1764640800000 } from "./1764640800000-workflow";

/** Every migration in order. Listed by hand so tsx, vitest and the CLI load the same classes (no glob imports). */
export const migrations = [Foundation1764633600000, Workflow1764640800000];
