import type { SampleTable } from "./types";

/** Sample requests for the routes in server/routes/designs*.routes.ts. */
export const designsSamples: SampleTable = {};
