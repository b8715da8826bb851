import { designsSamples } from "./designs";
import { foundationSamples } from "./foundation";
import { reviewsSamples } from "./reviews";
import { runsSamples } from "./runs";
import type { SampleTable } from "./types";

export type { Sample, SampleMaker, SampleTable } from "./types";

/** Every route's sample request, keyed "method /path"; the access matrix fails for a route without one. */
export const SAMPLES: SampleTable = { ...foundationSamples, ...designsSamples, ...runsSamples, ...reviewsSamples };
