import { readFileSync } from "node:fs";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DbGuard, REQUEST_TIMEOUT } from "../helpers/fuzz-api";
import { applyMutations, applyTextMutations, FUZZ_SEED, mutationsArb, textMutationsArb } from "../helpers/fuzz-arbitraries";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { SAMPLE_CSV, SAMPLE_S2P, sampleNetlist } from "./access-samples/designs";

/**
 * Bad files, fuzzed, through the upload routes: random bytes, truncated and mutated parts tables, netlist JSON and
 * Touchstone files, odd file names and malformed multipart requests. Each gets a 201 or a coded 4xx (mostly
 * INVALID_FILE naming the line) within a timeout, and a refused upload stores nothing.
 */

const FIXTURES = new URL("../fixtures/formats/", import.meta.url);
const fixture = (name: string) => readFileSync(new URL(name, FIXTURES), "utf8");
const TOUCHSTONE = [
  { name: "bench.s2p", text: SAMPLE_S2P },
  { name: "ladder.s2p", text: fixture("ladder-v2-db-21_12.s2p") },
  { name: "ladder-ri.s2p", text: fixture("ladder-v1-ri-mhz.s2p") },
  { name: "noise.s2p", text: fixture("info-noise-v2.s2p") },
  { name: "load.s1p", text: fixture("one-port.s1p") },
];
const CSV = [SAMPLE_CSV, fixture("parts-sample.csv").replace(/\bin\b/g, "n1").replace(/\bout\b/g, "n2")];
const FILE_NAMES = ["parts.csv", "netlist.json", "PARTS.CSV", "x.txt", "noext", ".csv", "ünïcode 🙂.csv", "a.s2p", "a.json.csv", "x".repeat(300) + ".csv", "../../etc/passwd.csv"];

let t: TestContext;
let designer: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let guard: DbGuard;
let designId: string;

beforeAll(async () => {
  t = await createTestContext();
  designer = await t.signedInAgent(["designer"]);
  const created = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "Upload target", netlist: sampleNetlist() }).expect(201);
  designId = created.body.design.id;
  guard = new DbGuard(t);
});
afterAll(() => t?.close());

function upload(route: "revisions/upload" | "measured", content: Buffer | string, fileName: string, fields: Record<string, string> = {}) {
  let req = designer.agent.post(`/api/designs/${designId}/${route}`).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach("file", Buffer.isBuffer(content) ? content : Buffer.from(content, "utf8"), fileName);
}

const bytesArb = fc.oneof(
  fc.uint8Array({ maxLength: 600 }).map((b) => Buffer.from(b)),
  fc.string({ unit: "binary", maxLength: 300 }).map((s) => Buffer.from(s, "utf8")),
  fc.constantFrom(Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from([0xff, 0xfe, 0x41, 0x00]), Buffer.alloc(0), Buffer.from("\u0000"), Buffer.from([0xc0, 0xaf])),
);

describe("fuzzed revision uploads (parts CSV and netlist JSON)", () => {
  it("random bytes under any file name: 201 or a coded 4xx, nothing stored when refused (50 uploads)", async () => {
    await fc.assert(
      fc.asyncProperty(bytesArb, fc.constantFrom(...FILE_NAMES), async (bytes, name) => {
        await guard.send(`upload ${name} ${bytes.toString("hex").slice(0, 120)}`, () => upload("revisions/upload", bytes, name));
      }),
      { seed: FUZZ_SEED + 40, numRuns: 50 },
    );
  });

  it("mutated and truncated parts tables (60 uploads)", async () => {
    let accepted = 0;
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...CSV), textMutationsArb, async (text, muts) => {
        const res = await guard.send(`upload csv ${JSON.stringify(muts).slice(0, 300)}`, () => upload("revisions/upload", applyTextMutations(text, muts), "parts.csv"));
        if (res.status === 201) accepted++;
        else if (res.status === 400) expect(res.body.error.code).toBe("INVALID_FILE");
      }),
      { seed: FUZZ_SEED + 41, numRuns: 60 },
    );
    expect(accepted).toBeGreaterThan(0);
  });

  it("mutated netlist JSON files, structurally and as text (2 × 30 uploads)", async () => {
    await fc.assert(
      fc.asyncProperty(mutationsArb, async (muts) => {
        const text = JSON.stringify(applyMutations(sampleNetlist(), muts), null, 2) ?? "null";
        await guard.send(`upload json ${JSON.stringify(muts).slice(0, 300)}`, () => upload("revisions/upload", text, "netlist.json"));
      }),
      { seed: FUZZ_SEED + 42, numRuns: 30 },
    );
    await fc.assert(
      fc.asyncProperty(textMutationsArb, async (muts) => {
        const text = applyTextMutations(JSON.stringify(sampleNetlist(), null, 2), muts);
        await guard.send(`upload json text ${JSON.stringify(muts).slice(0, 300)}`, () => upload("revisions/upload", text, "netlist.json"));
      }),
      { seed: FUZZ_SEED + 43, numRuns: 30 },
    );
  });
});

describe("fuzzed measured-response uploads (Touchstone)", () => {
  it("random bytes as .s1p/.s2p (40 uploads)", async () => {
    await fc.assert(
      fc.asyncProperty(bytesArb, fc.constantFrom("a.s1p", "a.s2p", "a.S2P", "a.s4p", "a.csv", "a"), async (bytes, name) => {
        await guard.send(`measured ${name} ${bytes.toString("hex").slice(0, 120)}`, () => upload("measured", bytes, name));
      }),
      { seed: FUZZ_SEED + 44, numRuns: 40 },
    );
  });

  it("mutated and truncated Touchstone files, v1.1 and v2.0, with random names (70 uploads)", async () => {
    let accepted = 0;
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...TOUCHSTONE), textMutationsArb, fc.option(fc.string({ unit: "binary", maxLength: 150 })), async (file, muts, name) => {
        const res = await guard.send(`measured ${file.name} ${JSON.stringify(muts).slice(0, 300)}`, () =>
          upload("measured", applyTextMutations(file.text, muts), file.name, name === null ? {} : { name }),
        );
        if (res.status === 201) {
          accepted++;
          const stored = await designer.agent.get(`/api/measured/${res.body.measured.id}`).timeout(REQUEST_TIMEOUT).expect(200);
          // what was stored reads back as numbers: a value JSON cannot hold (±Infinity, NaN) would come back null
          expect(JSON.stringify(stored.body)).not.toMatch(/null/);
        }
      }),
      { seed: FUZZ_SEED + 45, numRuns: 70 },
    );
    expect(accepted).toBeGreaterThan(0);
  });
});

describe("malformed multipart requests", () => {
  it("no file, two files, a file in another field, too many fields, JSON or text to an upload route (each 4xx, nothing stored)", async () => {
    const path = `/api/designs/${designId}/revisions/upload`;
    const post = () => designer.agent.post(path).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT);
    const cases: [string, () => PromiseLike<import("supertest").Response>][] = [
      ["no file", () => post().field("note", "x")],
      ["two files", () => post().attach("file", Buffer.from(SAMPLE_CSV), "a.csv").attach("file", Buffer.from(SAMPLE_CSV), "b.csv")],
      ["other field", () => post().attach("upload", Buffer.from(SAMPLE_CSV), "a.csv")],
      ["too many fields", () => Array.from({ length: 12 }, (_, k) => k).reduce((r, k) => r.field(`f${k}`, "x"), post()).attach("file", Buffer.from(SAMPLE_CSV), "a.csv")],
      ["huge field", () => post().field("note", "n".repeat(20_000)).attach("file", Buffer.from(SAMPLE_CSV), "a.csv")],
      ["note too long", () => post().field("note", "n".repeat(501)).attach("file", Buffer.from(SAMPLE_CSV), "a.csv")],
      ["json body", () => post().send({ file: SAMPLE_CSV })],
      ["text body", () => post().set("Content-Type", "text/csv").send(SAMPLE_CSV)],
      ["bad boundary", () => post().set("Content-Type", "multipart/form-data; boundary=zzz").send("--yyy\r\nContent-Disposition: form-data; name=\"file\"\r\n\r\nx\r\n--yyy--")],
      ["cut short", () => post().set("Content-Type", "multipart/form-data; boundary=zzz").send("--zzz\r\nContent-Disposition: form-data; name=\"file\"; filename=\"a.csv\"\r\n\r\nref,kind")],
      ["no boundary", () => post().set("Content-Type", "multipart/form-data").send("abc")],
    ];
    for (const [what, send] of cases) {
      const res = await guard.send(what, send);
      expect(res.status, what).toBeGreaterThanOrEqual(400);
    }
    // eslint-disable-next-line no-console
    console.info(`fuzz-uploads: ${guard.accepted} accepted, ${guard.rejected} rejected (${guard.summary()})`);
  });
});

describe("cases the fuzzing found (kept as fixed examples)", () => {
  it("a Touchstone value that overflows to Infinity is refused naming the line, not stored as null", async () => {
    const text = "# MHz S DB R 50\n10 1e308 0 -0.1 -10 -0.1 -10 -30 0\n";
    const res = await guard.send("overflowing dB", () => upload("measured", text, "bench.s2p"));
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: "INVALID_FILE", message: "line 2: S11 dB: out of range (1e+308 0 is not a finite complex value)" });
  });
});
