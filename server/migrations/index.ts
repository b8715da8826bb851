import { Foundation1764633600000 } from "./1764633600000-foundation";
import { Workflow1764640800000 } from "./1764640800000-workflow";
import { Trust1764892800000 } from "./1764892800000-trust";
import { HashedSessions1764896400000 } from "./1764896400000-hashed-sessions";
import { LeanResults1764900000000 } from "./1764900000000-lean-results";
import { SignoffWords1764903600000 } from "./1764903600000-signoff-words";

/** Every migration in order. Listed by hand so tsx, vitest and the CLI load the same classes (no glob imports). */
export const migrations = [Foundation1764633600000, Workflow1764640800000, Trust1764892800000, HashedSessions1764896400000, LeanResults1764900000000, SignoffWords1764903600000];
