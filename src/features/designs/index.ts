/**
 * What other features may use of the designs feature: its query keys and read queries (the data it owns).
 * Anything else in this folder is the feature's own.
 */
export { designKeys, measuredKeys, revisionKeys } from "@/features/designs/api/keys";
export { getDesignQueryOptions, useDesign, useDesignIfAny } from "@/features/designs/api/get-design";
export { getDesignsQueryOptions, useDesigns } from "@/features/designs/api/get-designs";
export { getMeasuredQueryOptions, useMeasured } from "@/features/designs/api/get-measured";
export { getRevisionQueryOptions, useRevision, useRevisionIfAny } from "@/features/designs/api/get-revision";
