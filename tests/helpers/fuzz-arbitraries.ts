import fc from "fast-check";

/**
 * fast-check building blocks for Lotwise's bad-input tests: nasty values, and mutations of a valid document
 * (drop, duplicate, retype a field, extreme numbers, NaN-like strings, huge arrays, unicode names, nodes that do not
 * exist). A mutation is plain data applied to a deep copy, so a failing case shrinks and prints readably.
 */

/** Fixed seed of every fuzz property (a failure replays exactly; change it to explore other cases). */
export const FUZZ_SEED = 20260501;

/** Numbers at the edges of IEEE 754 and of our ranges. */
export const EXTREME_NUMBERS: readonly number[] = [
  0, -0, -1, 1, 0.5, 1e308, -1e308, Number.MAX_VALUE, Number.MIN_VALUE, 5e-324, 1e-320, 2 ** 53 + 2, -(2 ** 31), 2 ** 31, 2 ** 31 - 1,
  1e6, 1e6 + 1, 10001, 10002, 500, 501, 1e-300, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY,
];

/** Strings that look like numbers to a careless parser, and names a careless store mangles. */
export const NASTY_STRINGS: readonly string[] = [
  "", " ", "NaN", "nan", "Infinity", "-Infinity", "1e999", "-1e999", "0x10", "1,5", " 1", "1 ", "1e", "1e-", "--1", "+", ".", "1..2",
  "null", "undefined", "true", "[]", "{}", "gnd", "GND", "n_missing", "Ω1", "C\u0301", "\u202eC1", "🙂", "🙂".repeat(20), "\ud800", "\udfff",
  "a\u0000b", "'; DROP TABLE run; --", "%00", "../../etc", "<script>", "=1+1", "x".repeat(300), "é".repeat(70),
];

/** Any JSON-ish value a client might send, weighted toward the nasty ones. */
export const nastyValue: fc.Arbitrary<unknown> = fc.oneof(
  { arbitrary: fc.constantFrom(...EXTREME_NUMBERS), weight: 3 },
  { arbitrary: fc.constantFrom(...NASTY_STRINGS), weight: 3 },
  { arbitrary: fc.constantFrom<unknown>(null, true, false, [], {}, [null], { value: 1 }), weight: 2 },
  { arbitrary: fc.double(), weight: 1 },
  { arbitrary: fc.integer(), weight: 1 },
  { arbitrary: fc.string({ unit: "binary", maxLength: 24 }), weight: 1 },
  { arbitrary: fc.jsonValue({ maxDepth: 2 }), weight: 1 },
);

export type MutationOp = "delete" | "set" | "retype" | "duplicate" | "addKey" | "hugeArray" | "extreme" | "nastyString" | "missingNode";

/** One mutation: which node (`at` modulo the number of nodes at that moment), what to do, and the material. */
export interface Mutation {
  at: number;
  op: MutationOp;
  value: unknown;
  key: string;
  size: number;
}

export const mutationArb: fc.Arbitrary<Mutation> = fc.record({
  at: fc.nat(),
  op: fc.constantFrom<MutationOp>("delete", "set", "retype", "duplicate", "addKey", "hugeArray", "extreme", "nastyString", "missingNode"),
  value: nastyValue,
  key: fc.oneof(fc.constantFrom("tolerence", "grade", "__proto__", "constructor", "extra", "value", "nodes"), fc.string({ maxLength: 8 })),
  size: fc.constantFrom(2, 50, 501, 2000),
});

/** 1–3 mutations. */
export const mutationsArb = fc.array(mutationArb, { minLength: 1, maxLength: 3 });

type Container = Record<string, unknown> | unknown[];
interface Slot {
  parent: Container | null;
  key: string | number;
}

function slotsOf(root: unknown): Slot[] {
  const out: Slot[] = [{ parent: null, key: "" }];
  const walk = (v: unknown) => {
    if (Array.isArray(v)) v.forEach((x, i) => (out.push({ parent: v, key: i }), walk(x)));
    else if (v !== null && typeof v === "object") for (const k of Object.keys(v)) out.push({ parent: v as Record<string, unknown>, key: k }), walk((v as Record<string, unknown>)[k]);
  };
  walk(root);
  return out;
}

function retype(v: unknown): unknown {
  if (typeof v === "number") return String(v);
  if (typeof v === "string") return v.trim() !== "" && !Number.isNaN(Number(v)) ? Number(v) : [v];
  if (typeof v === "boolean") return String(v);
  if (Array.isArray(v)) return Object.fromEntries(v.map((x, i) => [String(i), x]));
  if (v !== null && typeof v === "object") return Object.values(v);
  return 0;
}

/**
 * Applies mutations to a deep copy of `base` (JSON-like) and returns it. Node values keep NaN/Infinity (the engine
 * sees them; JSON.stringify turns them into null on the way to the API).
 */
export function applyMutations(base: unknown, mutations: readonly Mutation[]): unknown {
  let root: unknown = structuredClone(base);
  for (const m of mutations) {
    const slots = slotsOf(root);
    const slot = slots[m.at % slots.length];
    const get = (): unknown => (slot.parent === null ? root : (slot.parent as Record<string | number, unknown>)[slot.key]);
    const set = (v: unknown) => {
      if (slot.parent === null) root = v;
      else (slot.parent as Record<string | number, unknown>)[slot.key] = v;
    };
    const current = get();
    switch (m.op) {
      case "delete":
        if (slot.parent === null) root = undefined;
        else if (Array.isArray(slot.parent)) slot.parent.splice(slot.key as number, 1);
        else delete slot.parent[slot.key as string];
        break;
      case "set":
        set(structuredClone(m.value));
        break;
      case "retype":
        set(retype(current));
        break;
      case "duplicate":
        if (Array.isArray(slot.parent)) slot.parent.splice(slot.key as number, 0, structuredClone(current));
        else set([current, structuredClone(current)]);
        break;
      case "addKey":
        if (current !== null && typeof current === "object" && !Array.isArray(current)) Object.defineProperty(current, m.key, { value: structuredClone(m.value), enumerable: true, writable: true, configurable: true });
        else set({ [m.key]: current });
        break;
      case "hugeArray":
        set(Array.from({ length: m.size }, (_, i) => (Array.isArray(current) && current.length ? structuredClone(current[i % current.length]) : structuredClone(current))));
        break;
      case "extreme":
        set(EXTREME_NUMBERS[m.at % EXTREME_NUMBERS.length]);
        break;
      case "nastyString":
        set(NASTY_STRINGS[m.at % NASTY_STRINGS.length]);
        break;
      case "missingNode":
        set(typeof current === "string" ? `${current}_missing` : "n_missing");
        break;
    }
  }
  return root;
}

/**
 * JSON text of a value with some number tokens replaced by literals that JSON.parse turns into ±Infinity or 0
 * (`1e999`, `-1e999`, `1e-999`), which JSON.stringify alone can never produce.
 */
export function withOverflowingNumbers(json: string, pick: number): string {
  const literals = ["1e999", "-1e999", "1e-999", "-0"];
  let k = 0;
  return json.replace(/-?\b\d+(?:\.\d+)?(?:[eE][+-]?\d+)?\b/g, (tok) => (k++ % 3 === pick % 3 ? literals[(pick + k) % literals.length] : tok));
}

/** Mutations of a text file: drop, duplicate or truncate lines, replace tokens, insert bytes. Applied to `text`. */
export interface TextMutation {
  op: "truncate" | "dropLine" | "dupLine" | "replaceToken" | "insert" | "swapSeparators" | "repeatLine";
  at: number;
  with: string;
}

export const textMutationArb: fc.Arbitrary<TextMutation> = fc.record({
  op: fc.constantFrom<TextMutation["op"]>("truncate", "dropLine", "dupLine", "replaceToken", "insert", "swapSeparators", "repeatLine"),
  at: fc.nat(),
  with: fc.oneof(fc.constantFrom(...NASTY_STRINGS), fc.constantFrom('"', '""', ",", ";", "\t", "\r", "\n", "#", "!", "[", "]", "# Hz S RI R 0", "[Version] 2.0", "[Number of Frequencies] 999999999", "[Number of Ports] 4", "[Reference] 0 -50", "[Network Data]", "[End]", "1e308", "-1e308", "NaN"), fc.string({ unit: "binary", maxLength: 12 })),
});

export function applyTextMutations(text: string, mutations: readonly TextMutation[]): string {
  let t = text;
  for (const m of mutations) {
    const lines = t.split("\n");
    const li = m.at % Math.max(1, lines.length);
    switch (m.op) {
      case "truncate":
        t = t.slice(0, m.at % (t.length + 1));
        break;
      case "dropLine":
        lines.splice(li, 1);
        t = lines.join("\n");
        break;
      case "dupLine":
        lines.splice(li, 0, lines[li] ?? "");
        t = lines.join("\n");
        break;
      case "repeatLine":
        lines.splice(li, 0, ...Array.from({ length: 300 }, () => lines[li] ?? ""));
        t = lines.join("\n");
        break;
      case "replaceToken": {
        const tokens = [...t.matchAll(/[^\s,;]+/g)];
        if (tokens.length === 0) break;
        const tok = tokens[m.at % tokens.length];
        t = t.slice(0, tok.index) + m.with + t.slice(tok.index! + tok[0].length);
        break;
      }
      case "insert": {
        const at = m.at % (t.length + 1);
        t = t.slice(0, at) + m.with + t.slice(at);
        break;
      }
      case "swapSeparators":
        t = m.at % 2 ? t.replace(/,/g, ";") : t.replace(/ /g, ",");
        break;
    }
  }
  return t;
}

export const textMutationsArb = fc.array(textMutationArb, { minLength: 1, maxLength: 3 });
