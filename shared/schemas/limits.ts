import { z } from "zod";
import { MAX_FREQUENCY_HZ, MIN_FREQUENCY_HZ } from "../engine/frequency-grid";

/**
 * JSON shape of a Lotwise limit set, for the API, CLI and upload edges:
 * `{ "rules": [ { "metric": "s21_db", "from": 1e6, "to": 80e6, "min": -1, "label": "passband" } ] }`.
 * Metrics: `sIJ_db` (ports I, J as 1-based digits), `ripple_db`, `gd_ns`. Each rule needs `min` and/or
 * `max`; from < to; at most 100 rules. Whether a port index exists depends on the netlist, so that
 * check is in the engine (`validateLimits` in shared/engine/limits.ts, EngineError INVALID_LIMITS).
 */

const METRIC = /^(s[1-9][1-9]_db|ripple_db|gd_ns)$/;

const frequency = (what: string) =>
  z
    .number({ message: `${what} must be a number (Hz)` })
    .positive({ message: `${what} must be > 0 Hz` })
    .finite({ message: `${what} must be finite` })
    .min(MIN_FREQUENCY_HZ, { message: `${what} must be at least 1e-3 Hz (1 mHz)` })
    .max(MAX_FREQUENCY_HZ, { message: `${what} must be at most 1e12 Hz (1 THz)` });

export const limitRuleSchema = z
  .strictObject({
    metric: z.string().regex(METRIC, { message: 'unknown metric (use sIJ_db such as "s21_db", "ripple_db" or "gd_ns")' }),
    from: frequency("from"),
    to: frequency("to"),
    min: z.number({ message: "min must be a number" }).finite().optional(),
    max: z.number({ message: "max must be a number" }).finite().optional(),
    label: z.string().max(120, { message: "label is at most 120 characters" }).optional(),
  })
  .refine((r) => r.from < r.to, { message: "band must have from < to", path: ["to"] })
  .refine((r) => r.min !== undefined || r.max !== undefined, { message: "needs min and/or max", path: ["min"] })
  .refine((r) => r.min === undefined || r.max === undefined || r.min <= r.max, { message: "min is greater than max", path: ["min"] });

export const limitsSchema = z.object({
  rules: z.array(limitRuleSchema).max(100, { message: "at most 100 rules" }),
});

export type LimitRuleInput = z.infer<typeof limitRuleSchema>;
export type LimitsInput = z.infer<typeof limitsSchema>;
