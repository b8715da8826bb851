import type { User } from "../../../server/entities";
import type { TestContext } from "../../helpers/test-context";

/** A request that should succeed (2xx) for a caller the route's policy allows. */
export interface Sample {
  path: string;
  body?: unknown;
  /** multipart upload instead of JSON: field name → { content, filename } */
  files?: Record<string, { content: string; filename: string }>;
  fields?: Record<string, string>;
}

/** Builds a fresh sample for one call (each call may consume what it creates). Keyed "method /path" as in the route table. */
export type SampleMaker = (t: TestContext, caller: User) => Promise<Sample>;
export type SampleTable = Record<string, SampleMaker>;
