import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DbGuard, REQUEST_TIMEOUT } from "../helpers/fuzz-api";
import { applyMutations, FUZZ_SEED, mutationsArb, NASTY_STRINGS, withOverflowingNumbers } from "../helpers/fuzz-arbitraries";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { sampleLimits, sampleNetlist } from "./access-samples/designs";

/**
 * Bad input, fuzzed, through the API: mutated netlists (designs, new revisions, edited revisions), mutated limit
 * sets, and bodies that are not even JSON. Each request gets a 2xx or a coded 4xx, within a timeout, and a rejected
 * one leaves every table exactly as it was (tests/helpers/db-snapshot.ts).
 */

let t: TestContext;
let designer: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let planner: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let guard: DbGuard;
let designId: string;
let revisionId: string;
let limitSetId: string;

beforeAll(async () => {
  t = await createTestContext();
  designer = await t.signedInAgent(["designer"]);
  planner = await t.signedInAgent(["planner"]);
  const created = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "Fuzz target", netlist: sampleNetlist() }).expect(201);
  designId = created.body.design.id;
  revisionId = created.body.revision.id;
  const ls = await planner.agent.post(`/api/designs/${designId}/limit-sets`).set("Origin", ORIGIN).send({ name: "Mask", limits: sampleLimits(), lotSize: 100 }).expect(201);
  limitSetId = ls.body.limitSet?.id ?? ls.body.id;
  expect(limitSetId).toBeTruthy();
  guard = new DbGuard(t);
});
afterAll(() => t?.close());

/** Sends any value as JSON text (a bare number, string or null too, which supertest's object form refuses). */
const json = (agent: typeof designer.agent, method: "post" | "put", path: string, body: unknown) =>
  agent[method](path).set("Origin", ORIGIN).set("Content-Type", "application/json").timeout(REQUEST_TIMEOUT).send(JSON.stringify(body) ?? "null");

/** Sends raw text as application/json (for bodies JSON.stringify cannot make: 1e999, truncated, not JSON). */
const raw = (agent: typeof designer.agent, method: "post" | "put", path: string, text: string, type = "application/json") =>
  agent[method](path).set("Origin", ORIGIN).set("Content-Type", type).timeout(REQUEST_TIMEOUT).send(text);

const designBody = () => ({ name: "Fuzzed design", description: "fuzz", stress: "small-signal", netlist: sampleNetlist(), sweep: { from: 1e6, to: 1e9, points: 51, scale: "log" } });

describe("fuzzed netlists through the API", () => {
  it("POST /api/designs with a mutated body: 201 or a coded 400, nothing stored when refused (60 requests)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.boolean(), mutationsArb, async (wholeBody, muts) => {
        const body = wholeBody ? applyMutations(designBody(), muts) : { ...designBody(), netlist: applyMutations(sampleNetlist(), muts) };
        await guard.send(`POST /api/designs ${JSON.stringify(muts).slice(0, 300)}`, () => json(designer.agent, "post", "/api/designs", body ));
      }),
      { seed: FUZZ_SEED + 20, numRuns: 60 },
    );
    expect(guard.rejected).toBeGreaterThan(0);
  });

  it("POST /api/designs/:id/revisions and PUT /api/revisions/:id with mutated bodies (2 × 40 requests)", async () => {
    const base = () => ({ netlist: sampleNetlist(), sweep: { from: 1e6, to: 1e9, points: 51 }, note: "fuzz", parentId: revisionId });
    await fc.assert(
      fc.asyncProperty(mutationsArb, async (muts) => {
        const body = applyMutations(base(), muts);
        await guard.send(`POST revisions ${JSON.stringify(muts).slice(0, 300)}`, () => json(designer.agent, "post", `/api/designs/${designId}/revisions`, body ));
      }),
      { seed: FUZZ_SEED + 21, numRuns: 40 },
    );
    await fc.assert(
      fc.asyncProperty(mutationsArb, async (muts) => {
        const { parentId: _p, ...body } = base();
        await guard.send(`PUT revision ${JSON.stringify(muts).slice(0, 300)}`, () => json(designer.agent, "put", `/api/revisions/${revisionId}`, applyMutations(body, muts) ));
      }),
      { seed: FUZZ_SEED + 22, numRuns: 40 },
    );
  });

  it("POST /api/designs/:id/limit-sets and PUT /api/limit-sets/:id with mutated limits (2 × 40 requests)", async () => {
    const base = () => ({ name: "Fuzzed mask", limits: { rules: [...sampleLimits().rules, { metric: "s11_db", from: 1e6, to: 60e6, max: -10 }, { metric: "gd_ns", from: 1e6, to: 60e6, max: 20 }] }, lotSize: 1000 });
    await fc.assert(
      fc.asyncProperty(mutationsArb, async (muts) => {
        await guard.send(`POST limit set ${JSON.stringify(muts).slice(0, 300)}`, () => json(planner.agent, "post", `/api/designs/${designId}/limit-sets`, applyMutations(base(), muts) ));
      }),
      { seed: FUZZ_SEED + 23, numRuns: 40 },
    );
    await fc.assert(
      fc.asyncProperty(mutationsArb, async (muts) => {
        await guard.send(`PUT limit set ${JSON.stringify(muts).slice(0, 300)}`, () => json(planner.agent, "put", `/api/limit-sets/${limitSetId}`, applyMutations(base(), muts) ));
      }),
      { seed: FUZZ_SEED + 24, numRuns: 40 },
    );
  });

  it("bodies JSON.stringify cannot make: overflowing numbers, truncated text, other content types (50 requests)", async () => {
    const validText = JSON.stringify(designBody());
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.nat().map((pick) => ({ text: withOverflowingNumbers(validText, pick), type: "application/json" })),
          fc.nat({ max: validText.length }).map((n) => ({ text: validText.slice(0, n), type: "application/json" })),
          fc.string({ unit: "binary", maxLength: 200 }).map((text) => ({ text, type: "application/json" })),
          fc.constantFrom(...NASTY_STRINGS).map((text) => ({ text, type: "application/json" })),
          fc.constantFrom("text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", "application/json; charset=latin1", "application/json; charset=utf-16").map((type) => ({ text: validText, type })),
        ),
        fc.constantFrom("post /api/designs", `post /api/designs/:id/revisions`, "put /api/revisions/:id"),
        async ({ text, type }, route) => {
          const [method, path] = route.split(" ") as ["post" | "put", string];
          const url = path.replace("/designs/:id", `/designs/${designId}`).replace("/revisions/:id", `/revisions/${revisionId}`);
          await guard.send(`${route} raw ${JSON.stringify(text.slice(0, 120))} as ${type}`, () => raw(designer.agent, method, url, text, type));
        },
      ),
      { seed: FUZZ_SEED + 25, numRuns: 50 },
    );
    // eslint-disable-next-line no-console
    console.info(`fuzz-netlists: ${guard.accepted} accepted, ${guard.rejected} rejected (${guard.summary()})`);
  });
});

describe("cases the fuzzing found (kept as fixed examples)", () => {
  it("a JSON body in a charset the parser cannot decode is a 400 INVALID_JSON, not a 500", async () => {
    const res = await guard.send("latin1 body", () => raw(designer.agent, "post", "/api/designs", JSON.stringify(designBody()), "application/json; charset=latin1"));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("INVALID_JSON");
    expect(res.body.error.message).toMatch(/unsupported charset "LATIN1"/);
  });

  it("a body with an unknown Content-Encoding is a 400 INVALID_JSON, not a 500", async () => {
    const res = await guard.send("x-unknown encoding", () => raw(designer.agent, "post", "/api/designs", "{}").set("Content-Encoding", "x-unknown"));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("INVALID_JSON");
  });
});
