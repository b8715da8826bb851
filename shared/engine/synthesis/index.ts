/**
 * Lotwise synthesis helpers: normalized all-pole prototypes, doubly terminated LC ladders (low-pass,
 * high-pass, band-pass, band-stop; shunt-first or series-first) and L-section matching, each returned as
 * a netlist for the engine.
 */
export type { FilterFamily, LadderSpec, LMatchSpec, PrototypeValues, ResponseType } from "./types";
export { prototypeValues, MAX_ORDER, MIN_RIPPLE_DB, MAX_RIPPLE_DB } from "./prototypes";
export { synthesizeLadder } from "./transforms";
export { designLMatch } from "./l-match";
