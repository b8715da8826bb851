/**
 * Lone UTF-16 surrogates: a JSON text may spell one ("\ud800"), JavaScript keeps it in a string, but it is not
 * Unicode text. MariaDB refuses it in a JSON column (the request would fail with 500) and UTF-8 cannot carry it
 * (a varchar would silently store U+FFFD instead), so every request input is checked once, at the edge.
 */

const UNPAIRED = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const UNPAIRED_ALL = new RegExp(UNPAIRED.source, "g");

export const UNPAIRED_SURROGATE_MESSAGE = "must be valid Unicode text (it holds a lone UTF-16 surrogate such as \\ud800)";

/** True when the string holds a high surrogate without its low half, or a low one without its high half. */
export function hasUnpairedSurrogate(text: string): boolean {
  return UNPAIRED.test(text);
}

interface Visit {
  value: unknown;
  key: string | number | null;
  parent: Visit | null;
}

/**
 * The path (as zod gives it: keys and array indexes) of a string that holds a lone surrogate, or of an object key
 * that does (the surrogate shown as U+FFFD there); null when there is none. Earlier entries are found first.
 * Iterative, so a deeply nested body cannot exhaust the stack.
 */
export function findUnpairedSurrogate(value: unknown): (string | number)[] | null {
  const stack: Visit[] = [{ value, key: null, parent: null }];
  while (stack.length > 0) {
    const visit = stack.pop()!;
    const v = visit.value;
    if (typeof v === "string") {
      if (UNPAIRED.test(v)) return pathOf(visit);
      continue;
    }
    if (v === null || typeof v !== "object") continue;
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i -= 1) stack.push({ value: v[i], key: i, parent: visit });
      continue;
    }
    const keys = Object.keys(v);
    for (const key of keys) if (UNPAIRED.test(key)) return [...pathOf(visit), key.replace(UNPAIRED_ALL, "\uFFFD")];
    for (let i = keys.length - 1; i >= 0; i -= 1) stack.push({ value: (v as Record<string, unknown>)[keys[i]], key: keys[i], parent: visit });
  }
  return null;
}

function pathOf(visit: Visit): (string | number)[] {
  const path: (string | number)[] = [];
  for (let at: Visit | null = visit; at && at.key !== null; at = at.parent) path.push(at.key);
  return path.reverse();
}
