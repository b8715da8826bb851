import { z } from "zod";

/** Keys that name no part but an object's machinery; zod's record drops `__proto__` silently, so it is refused first. */
const NOT_PART_REFS = new Set(["__proto__", "constructor", "prototype"]);

/**
 * A record keyed by part ref (grade or tolerance overrides). A key such as `__proto__` is refused with an issue at
 * its own path (`gradeOverrides.__proto__`) instead of vanishing from the parsed value.
 */
export function partRecord<K extends z.ZodType<string>, V extends z.ZodType>(key: K, value: V) {
  return z.preprocess((raw, ctx) => {
    if (raw !== null && typeof raw === "object" && !Array.isArray(raw)) {
      for (const k of Object.keys(raw)) {
        if (NOT_PART_REFS.has(k)) ctx.addIssue({ code: "custom", message: `"${k}" is not a part ref`, path: [k], input: raw });
      }
    }
    return raw;
  }, z.record(key, value));
}
