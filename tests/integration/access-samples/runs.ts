import type { SampleTable } from "./types";

/** Sample requests for the routes in server/routes/runs*.routes.ts. */
export const runsSamples: SampleTable = {};
