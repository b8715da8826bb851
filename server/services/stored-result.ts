/** The JSON a finished run is stored as (run_result.result): the engine result made JSON-safe. */
import type { RunResult } from "../../shared/engine/result";

/**
 * The stored JSON of a finished run: the engine result made JSON-safe. The frequency grid and the nominal curves are
 * in it once, as `envelopes.freqs` and each `envelopes.series[].nominal` (rows stored before 2026-12 also repeated them
 * as top-level `freqs` and `nominal`; migration LeanResults1764900000000 removed those).
 */
export function toStoredResult(result: RunResult): Record<string, unknown> {
  return jsonSafe(result) as Record<string, unknown>;
}

/** Typed arrays → arrays, non-finite numbers → null, recursively. */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === "number") return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value)) return Array.from(value as unknown as ArrayLike<number>, (x) => (Number.isFinite(x) ? x : null));
  if (Array.isArray(value)) return value.map(jsonSafe);
  if (value !== null && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (v !== undefined) out[k] = jsonSafe(v);
    return out;
  }
  return value;
}
