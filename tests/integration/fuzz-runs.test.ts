import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run } from "../../server/entities";
import { DbGuard, REQUEST_TIMEOUT } from "../helpers/fuzz-api";
import { applyMutations, FUZZ_SEED, mutationsArb, NASTY_STRINGS, nastyValue } from "../helpers/fuzz-arbitraries";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeSampleGrade } from "./access-samples/designs";
import { makeDesign, makeRun, type DesignFixture } from "./access-samples/reviews";

/**
 * Bad input, fuzzed, through the run API: random and mutated run requests (POST /api/runs) and random query strings
 * and path parameters on the history, compare, run and trial routes. Each request gets a 2xx or a coded 4xx within
 * a timeout; a rejected one leaves every table as it was. The run queue is stopped first, so an accepted run stays
 * queued and the only writes to the database are the requests' own.
 */

let t: TestContext;
let analyst: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let guard: DbGuard;
let fixture: DesignFixture;
let other: DesignFixture;
let doneRun: Run;
let gradeCode: string;

beforeAll(async () => {
  t = await createTestContext();
  await t.ctx.runQueue.close(); // accepted runs stay queued: no background writes, no CPU
  analyst = await t.signedInAgent(["analyst", "reviewer"]);
  fixture = await makeDesign(t, analyst.user, { name: "Fuzz low-pass" });
  other = await makeDesign(t, analyst.user, { name: "Other low-pass" });
  doneRun = await makeRun(t, fixture, analyst.user, { trials: 20, passed: 19 });
  await makeRun(t, other, analyst.user, { state: "failed", passed: null });
  gradeCode = (await makeSampleGrade(t)).code;
  guard = new DbGuard(t);
});
afterAll(() => t?.close());

const postJson = (path: string, body: unknown) =>
  analyst.agent.post(path).set("Origin", ORIGIN).set("Content-Type", "application/json").timeout(REQUEST_TIMEOUT).send(JSON.stringify(body) ?? "null");
const get = (path: string) => analyst.agent.get(path).timeout(REQUEST_TIMEOUT);

describe("fuzzed run requests", () => {
  const baseRun = () => ({
    revisionId: fixture.revision.id,
    limitSetId: fixture.limitSet.id,
    trials: 50,
    seed: 7,
    targetHalfWidth: 0.05,
    corners: [-40, 25, 85],
    gradeOverrides: { C1: gradeCode },
    toleranceOverrides: { L2: { tolerance: 0.02 }, C3: { toleranceAbs: 2.5e-13 } },
    label: "fuzz",
  });

  it("POST /api/runs with a mutated request: 201 (queued) or a coded 4xx, nothing stored when refused (80 requests)", async () => {
    await fc.assert(
      fc.asyncProperty(mutationsArb, fc.constantFrom("same", "other-limits", "missing-revision"), async (muts, ids) => {
        const body = applyMutations(baseRun(), muts) as Record<string, unknown>;
        if (body && typeof body === "object" && !Array.isArray(body)) {
          if (ids === "other-limits") body.limitSetId = other.limitSet.id;
          if (ids === "missing-revision") body.revisionId = "3b241101-e2bb-4255-8caf-4136c566a962";
        }
        await guard.send(`POST /api/runs (${ids}) ${JSON.stringify(muts).slice(0, 300)}`, () => postJson("/api/runs", body));
      }),
      { seed: FUZZ_SEED + 30, numRuns: 80 },
    );
    expect(guard.accepted).toBeGreaterThan(0);
    expect(guard.rejected).toBeGreaterThan(0);
  });

  it("POST /api/runs with random JSON documents (40 requests)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.jsonValue({ maxDepth: 3 }), fc.dictionary(fc.constantFrom("revisionId", "limitSetId", "trials", "seed", "corners", "gradeOverrides", "toleranceOverrides", "label", "sweepId", "targetHalfWidth"), nastyValue)), async (body) => {
        await guard.send(`POST /api/runs ${JSON.stringify(body).slice(0, 300)}`, () => postJson("/api/runs", body));
      }),
      { seed: FUZZ_SEED + 31, numRuns: 40 },
    );
  });
});

/** Percent-encodes the UTF-8 bytes of s (a lone surrogate becomes U+FFFD's bytes instead of a URIError). */
const pct = (s: string) => [...Buffer.from(s, "utf8")].map((b) => (/[A-Za-z0-9_.~-]/.test(String.fromCharCode(b)) ? String.fromCharCode(b) : `%${b.toString(16).toUpperCase().padStart(2, "0")}`)).join("");
/** Escapes a URL parser must cope with: bad hex, a lone %, overlong and invalid UTF-8. */
const BAD_ESCAPES = ["%", "%zz", "%C0%AF", "%FF", "%E2%82", "%00", "%2e%2e%2f"];

/** A query string from key/value pairs, each value URL-encoded or left raw (%, &, = and all). */
const queryArb = (keys: readonly string[]) =>
  fc
    .array(
      fc.tuple(
        fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 6 }), fc.constantFrom("state[]", "page[0]", "__proto__", "constructor")),
        fc.oneof(
          fc.constantFrom(...NASTY_STRINGS),
          fc.constantFrom("done", "queued,failed", "done,,", "yield", "design", "asc", "DESC", "1", "0", "100", "101", "100000", "100001", "-1", "1.5", "1e3", "2025-03-01", "2025-02-30", "2025-03-01T12:00:00Z", "9999-99-99", "0.5", "2"),
          fc.uuid().map(String),
          fc.string({ unit: "binary", maxLength: 20 }),
        ),
        fc.boolean(),
      ),
      { maxLength: 6 },
    )
    .map((pairs) => pairs.map(([k, v, encode]) => (encode ? `${pct(k)}=${pct(v)}` : `${pct(k)}=${BAD_ESCAPES[v.length % BAD_ESCAPES.length]}${v.replace(/[^A-Za-z0-9,.:-]/g, "")}`)).join("&"));

const HISTORY_KEYS = ["designId", "revisionId", "launchedBy", "state", "from", "to", "minYield", "maxYield", "sort", "dir", "page", "pageSize"] as const;

describe("fuzzed query strings and path parameters", () => {
  it("GET /api/runs?… with random filters, sorting and paging: 200 or a coded 400 (100 requests)", async () => {
    let ok = 0;
    await fc.assert(
      fc.asyncProperty(queryArb(HISTORY_KEYS), async (qs) => {
        const res = await guard.send(`GET /api/runs?${qs}`, () => get(`/api/runs?${qs}`));
        if (res.status === 200) {
          ok++;
          expect(Array.isArray(res.body.runs)).toBe(true);
          expect(res.body.runs.length).toBeLessThanOrEqual(res.body.pageSize);
        } else expect(res.body.error.code).toBe("VALIDATION_FAILED");
      }),
      { seed: FUZZ_SEED + 32, numRuns: 100 },
    );
    expect(ok).toBeGreaterThan(0);
  });

  it("GET /api/runs/compare?ids=… and /api/designs?archived=… with random values (2 × 30 requests)", async () => {
    const ids = fc.array(fc.oneof(fc.constant(doneRun.id), fc.uuid().map(String), fc.constantFrom(...NASTY_STRINGS)), { maxLength: 8 }).map((a) => a.join(","));
    await fc.assert(
      fc.asyncProperty(fc.oneof(ids.map((v) => `ids=${pct(v)}`), queryArb(["ids"])), async (qs) => {
        await guard.send(`GET /api/runs/compare?${qs}`, () => get(`/api/runs/compare?${qs}`));
      }),
      { seed: FUZZ_SEED + 33, numRuns: 30 },
    );
    await fc.assert(
      fc.asyncProperty(queryArb(["archived"]), async (qs) => {
        await guard.send(`GET /api/designs?${qs}`, () => get(`/api/designs?${qs}`));
      }),
      { seed: FUZZ_SEED + 34, numRuns: 30 },
    );
  });

  it("GET run, trial replay and export routes with random ids and trial numbers (60 requests)", async () => {
    const segment = fc.oneof(fc.constantFrom(...NASTY_STRINGS), fc.string({ unit: "binary", maxLength: 40 }), fc.uuid().map(String), fc.constantFrom("0", "19", "20", "-1", "1e3", "007", "999999999", "9999999999", "1.5", "0x1"));
    await fc.assert(
      fc.asyncProperty(fc.constantFrom("run", "trial", "trial.s2p", "trials.csv", "events", "comments", "review"), segment, fc.boolean(), async (route, raw, known) => {
        const x = known || raw.length % 5 ? pct(raw) : `${BAD_ESCAPES[raw.length % BAD_ESCAPES.length]}${pct(raw)}`;
        const runId = known ? doneRun.id : x;
        const path = {
          run: `/api/runs/${x}`,
          trial: `/api/runs/${runId}/trials/${x}`,
          "trial.s2p": `/api/runs/${runId}/trials/${x}.s2p`,
          "trials.csv": `/api/runs/${x}/trials.csv`,
          events: `/api/runs/${x}/events`,
          comments: `/api/runs/${x}/comments`,
          review: `/api/revisions/${x}/review`,
        }[route];
        await guard.send(`GET ${path}`, () => get(path));
      }),
      { seed: FUZZ_SEED + 35, numRuns: 60 },
    );
    // eslint-disable-next-line no-console
    console.info(`fuzz-runs: ${guard.accepted} accepted, ${guard.rejected} rejected (${guard.summary()})`);
  });
});

describe("cases the fuzzing found (kept as fixed examples)", () => {
  it("a path parameter with a malformed %-escape is a 400 VALIDATION_FAILED, not a 500", async () => {
    for (const path of ["/api/runs/%", "/api/runs/%zz/trials/1", `/api/runs/${doneRun.id}/trials/%E2%82`, "/api/revisions/%C0/review"]) {
      const res = await guard.send(`GET ${path}`, () => get(path));
      expect(res.status, path).toBe(400);
      expect(res.body.error.code, path).toBe("VALIDATION_FAILED");
    }
  });
});
