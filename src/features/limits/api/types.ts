import type { Limits } from "@shared/engine/limits";

/** A planner's acceptance limits for a design, with the lot size used for cost figures. */
export type LimitSet = { id: string; designId: string; name: string; limits: Limits; lotSize: number; updatedAt: string };

export type LimitSetInput = { name: string; limits: Limits; lotSize: number };
