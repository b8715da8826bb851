import type { SampleTable } from "./types";

/** Sample requests for the routes in server/routes/reviews*.routes.ts. */
export const reviewsSamples: SampleTable = {};
