import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { FormatError } from "../../../shared/formats/format-error";
import { parsePartsCsv, PARTS_CSV_LIMITS } from "../../../shared/formats/parts-csv";
import { parseTouchstone, TOUCHSTONE_LIMITS, type TouchstoneData } from "../../../shared/formats/touchstone";
import { partSchema } from "../../../shared/schemas/netlist";
import { applyTextMutations, FUZZ_SEED, textMutationsArb } from "../../helpers/fuzz-arbitraries";

/**
 * Bad files, fuzzed, straight into the readers the uploads use: random text, random bytes decoded as text,
 * truncated and mutated valid parts tables and Touchstone files. Every call returns data that holds up (finite,
 * in range, the shape it claims) or throws a FormatError INVALID_FILE naming the line and field — never a
 * TypeError or RangeError, never a slow path.
 */

const FIXTURES = new URL("../../fixtures/formats/", import.meta.url);
const fixture = (name: string) => readFileSync(new URL(name, FIXTURES), "utf8");
const CALL_BUDGET_MS = 2000;

const CSV_FILES = [fixture("parts-sample.csv"), "ref,kind,node1,node2,value,tolerance\nC1,C,n1,gnd,33p,J\nL2,L,n1,n2,150n,J\nC3,C,n2,gnd,33p,J\n"];
const TOUCHSTONE_FILES: { name: string; text: string }[] = [
  "ladder-v1-db-hz.s2p", "ladder-v1-ma-ghz.s2p", "ladder-v1-ri-mhz.s2p", "ladder-v2-ma-12_21.s2p", "ladder-v2-db-21_12.s2p", "noise-v1.s2p", "info-noise-v2.s2p", "one-port.s1p",
].map((name) => ({ name, text: fixture(name) }));

function readerCall<T>(fn: () => T): { ok: true; value: T } | { ok: false; error: FormatError } {
  const t0 = performance.now();
  try {
    return { ok: true, value: fn() };
  } catch (error) {
    if (!(error instanceof FormatError)) throw new Error(`not a FormatError: ${(error as Error)?.stack ?? String(error)}`);
    expect(error.code).toBe("INVALID_FILE");
    expect(error.reason.length).toBeGreaterThan(0);
    if (error.line !== undefined) expect(Number.isInteger(error.line) && error.line >= 1).toBe(true);
    return { ok: false, error };
  } finally {
    expect(performance.now() - t0).toBeLessThan(CALL_BUDGET_MS);
  }
}

/** What a returned parts table must satisfy: every part passes the netlist schema the upload applies next. */
function checkParts(parts: unknown[]): void {
  expect(parts.length).toBeGreaterThan(0);
  expect(parts.length).toBeLessThanOrEqual(PARTS_CSV_LIMITS.maxParts);
  for (const p of parts) {
    const r = partSchema.safeParse(p);
    if (!r.success) throw new Error(`parsePartsCsv returned a part the schema refuses: ${JSON.stringify(p)} — ${r.error.issues[0].message}`);
  }
}

/** What a returned Touchstone must satisfy. */
function checkTouchstone(d: TouchstoneData): void {
  expect(d.ports).toBeGreaterThanOrEqual(1);
  expect(d.ports).toBeLessThanOrEqual(TOUCHSTONE_LIMITS.maxPorts);
  expect(d.freqs.length).toBeGreaterThan(0);
  expect(d.freqs.length).toBeLessThanOrEqual(TOUCHSTONE_LIMITS.maxFrequencies);
  expect(d.s.length).toBe(d.freqs.length * d.ports * d.ports * 2);
  expect(d.z0.length).toBe(d.ports);
  for (const z of d.z0) expect(Number.isFinite(z) && z > 0, `z0 ${z}`).toBe(true);
  for (let f = 0; f < d.freqs.length; f++) {
    if (!(Number.isFinite(d.freqs[f]) && d.freqs[f] >= 0)) throw new Error(`freqs[${f}] = ${d.freqs[f]}`);
    if (f > 0 && !(d.freqs[f] > d.freqs[f - 1])) throw new Error(`freqs not increasing at ${f}`);
  }
  for (let k = 0; k < d.s.length; k++) if (!Number.isFinite(d.s[k])) throw new Error(`s[${k}] = ${d.s[k]}`);
}

const randomText = fc.oneof(
  fc.string({ unit: "binary", maxLength: 400 }),
  fc.uint8Array({ maxLength: 400 }).map((b) => new TextDecoder().decode(b)),
  fc.array(fc.oneof(fc.constantFrom(",", ";", '"', "\n", "\r\n", "#", "!", " ", "\t", "p", "n", "k", "e", "E", "-", "+", ".", "%", "[", "]"), fc.integer({ min: -9, max: 99 }).map(String)), { maxLength: 200 }).map((a) => a.join("")),
);

describe("parsePartsCsv under fuzzed tables", () => {
  it("reads random text or refuses it with a line-numbered INVALID_FILE (300 texts)", () => {
    fc.assert(
      fc.property(randomText, (text) => {
        const r = readerCall(() => parsePartsCsv(text));
        if (r.ok) checkParts(r.value.parts);
      }),
      { seed: FUZZ_SEED + 10, numRuns: 300 },
    );
  });

  it("reads mutated and truncated valid tables, or refuses them naming line and column (400 mutants)", () => {
    let read = 0;
    fc.assert(
      fc.property(fc.constantFrom(...CSV_FILES), textMutationsArb, (text, muts) => {
        const r = readerCall(() => parsePartsCsv(applyTextMutations(text, muts)));
        if (r.ok) {
          read++;
          checkParts(r.value.parts);
        } else expect(r.error.field, r.error.message).toBeTruthy();
      }),
      { seed: FUZZ_SEED + 11, numRuns: 400 },
    );
    expect(read).toBeGreaterThan(0);
  });

  it(`reads ${PARTS_CSV_LIMITS.maxParts} parts and refuses ${PARTS_CSV_LIMITS.maxParts + 1}, naming the limit and the line`, () => {
    const table = (n: number) => "ref,kind,node1,node2,value\n" + Array.from({ length: n }, (_, k) => `R${k},R,n${k},n${k + 1},50`).join("\n") + "\n";
    const ok = readerCall(() => parsePartsCsv(table(PARTS_CSV_LIMITS.maxParts)));
    expect(ok.ok && ok.value.parts.length).toBe(500); // README "Parts table (CSV)": at most 500 parts
    const refused = readerCall(() => parsePartsCsv(table(PARTS_CSV_LIMITS.maxParts + 1)));
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.error.message).toBe("line 502: ref: too many parts: at most 500 parts are supported"); // header is line 1, part 501 on line 502
  });
});

describe("parseTouchstone under fuzzed files", () => {
  it("reads random text or refuses it with INVALID_FILE (300 texts, with and without a .s2p name)", () => {
    fc.assert(
      fc.property(randomText, fc.constantFrom(undefined, "x.s1p", "x.s2p", "x.s4p", "x.s9p", "x.txt"), (text, fileName) => {
        const r = readerCall(() => parseTouchstone(text, fileName === undefined ? {} : { fileName }));
        if (r.ok) checkTouchstone(r.value);
      }),
      { seed: FUZZ_SEED + 12, numRuns: 300 },
    );
  });

  it("reads mutated and truncated valid files (v1.1 and v2.0, every format), or refuses them naming the line (500 mutants)", () => {
    let read = 0;
    fc.assert(
      fc.property(fc.constantFrom(...TOUCHSTONE_FILES), textMutationsArb, (file, muts) => {
        const r = readerCall(() => parseTouchstone(applyTextMutations(file.text, muts), { fileName: file.name }));
        if (r.ok) {
          read++;
          checkTouchstone(r.value);
        }
      }),
      { seed: FUZZ_SEED + 13, numRuns: 500 },
    );
    expect(read).toBeGreaterThan(0);
  });

  it(`reads ${TOUCHSTONE_LIMITS.maxFrequencies} frequencies and refuses ${TOUCHSTONE_LIMITS.maxFrequencies + 1}, naming the limit`, () => {
    const file = (n: number) => "# Hz S RI R 50\n" + Array.from({ length: n }, (_, k) => `${k + 1} 0.5 0`).join("\n") + "\n";
    const ok = readerCall(() => parseTouchstone(file(TOUCHSTONE_LIMITS.maxFrequencies), { ports: 1 }));
    expect(ok.ok && ok.value.freqs.length).toBe(100_001); // README "Measured responses": at most 100,001 points
    const refused = readerCall(() => parseTouchstone(file(TOUCHSTONE_LIMITS.maxFrequencies + 1), { ports: 1 }));
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.error.message).toContain("at most 100001 frequency points");
  });
});

describe("cases the fuzzing found (kept as fixed examples)", () => {
  it("refuses a dB value that overflows to an infinite magnitude, naming the line and the field", () => {
    // 10^(400/20) = 1e20 is finite; 10^(1e308/20) overflows to Infinity (IEEE 754 double max ≈ 1.8e308)
    const r = readerCall(() => parseTouchstone("# Hz S DB R 50\n1e8 1e308 0\n", { ports: 1 }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toBe("line 2: S11 dB: out of range (1e+308 0 is not a finite complex value)");
    expect(readerCall(() => parseTouchstone("# Hz S DB R 50\n1e8 400 0\n", { ports: 1 })).ok).toBe(true);
  });

  it("refuses a frequency that overflows once scaled to Hz", () => {
    const r = readerCall(() => parseTouchstone("# GHz S RI R 50\n1e308 0.5 0\n", { ports: 1 }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toBe("line 2: frequency: out of range (1e308 is not a finite frequency in Hz)");
  });
});
