import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { DesignRevision, Grade, type User } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import { replayTrial, runMonteCarlo } from "../../shared/engine/monte-carlo";
import { buildFrequencyGrid } from "../../shared/engine/frequency-grid";
import { validateLimits } from "../../shared/engine/limits";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../../shared/engine/solver";
import { parseTouchstone } from "../../shared/formats/touchstone";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { insertRun, LOWPASS, LOWPASS_LIMITS, LOWPASS_SWEEP, makeRunFixture, type RunFixture } from "./access-samples/runs";

// Runs through the API on a real MariaDB: launch → queue → stored result equal to the engine's own run of
// the same inputs; replay, CSV and Touchstone exports recomputed from the seed; 400s with field paths.

let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let user: User;
let f: RunFixture;
const SEED = 4242;
const TRIALS = 600;
let runId: string;
let detail: any;

const textParser = (res: any, cb: (err: Error | null, body: string) => void) => {
  let data = "";
  res.setEncoding("utf8");
  res.on("data", (c: string) => (data += c));
  res.on("end", () => cb(null, data));
};

beforeAll(async () => {
  t = await createTestContext();
  ({ agent, user } = await t.signedInAgent(["analyst"]));
  f = await makeRunFixture(t, user, { lotSize: 500, name: "Harmonic low-pass" });
  const launched = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: TRIALS, seed: SEED });
  expect(launched.status, JSON.stringify(launched.body)).toBe(201);
  runId = launched.body.run.id;
  await t.ctx.runQueue.idle();
  detail = (await agent.get(`/api/runs/${runId}`).expect(200)).body;
}, 30_000);
afterAll(() => t?.close());

describe("a run launched through the API", () => {
  it("is stored queued with the inputs copied, then completes done", async () => {
    expect(detail.run).toMatchObject({ state: "done", trialsDone: TRIALS, trialsTotal: TRIALS, seed: SEED, designName: "Harmonic low-pass", revisionNumber: 1, launchedBy: { id: user.id } });
    expect(detail.run.options).toEqual({ trials: TRIALS, seed: SEED, sweep: LOWPASS_SWEEP });
    expect(detail.run.netlist).toEqual(LOWPASS);
    const rev = await t.ctx.dataSource.getRepository(DesignRevision).findOneByOrFail({ id: f.revision.id });
    expect(rev.locked).toBe(true);
  });

  it("reads back histograms, envelopes and the rest equal to the engine's run of the same inputs", async () => {
    // [C] computed by the engine in this thread with the revision's netlist, the limit set and the same seed
    const engine = await runMonteCarlo(LOWPASS, LOWPASS_LIMITS, { trials: TRIALS, seed: SEED, sweep: LOWPASS_SWEEP });
    const stored = detail.result;
    expect(stored.rules.map((r: any) => r.histogram)).toEqual(engine.rules.map((r) => r.histogram));
    expect(stored.envelopes).toEqual(JSON.parse(JSON.stringify(engine.envelopes)));
    expect(stored).toEqual(JSON.parse(JSON.stringify(toStoredResult(engine))));
    expect(engine.passed).toBeGreaterThan(0);
    expect(engine.passed).toBeLessThan(TRIALS); // the limits are tight enough that the test sees failures
    expect(detail.run).toMatchObject({ passed: engine.passed, yield: engine.yield, wilson95: engine.wilson95 });
  });

  it("stores the grid and nominal |S| dB per pair once, in the envelopes", async () => {
    const compiled = compileNetlist(LOWPASS);
    const grid = buildFrequencyGrid(LOWPASS_SWEEP, validateLimits(LOWPASS_LIMITS, 2));
    const buf = createSweepEvaluator(compiled, grid.freqs).evaluate(nominalValues(compiled), 25);
    expect(detail.result.freqs).toBeUndefined(); // no second copy of the grid
    expect(detail.result.nominal).toBeUndefined();
    expect(detail.result.envelopes.freqs).toEqual(Array.from(grid.freqs));
    const series = Object.fromEntries(detail.result.envelopes.series.map((s: { metric: string; nominal: number[] }) => [s.metric, s.nominal]));
    expect(Object.keys(series).sort()).toEqual(["s11_db", "s12_db", "s21_db", "s22_db"]);
    // [C] |S21| dB from the solver's complex S at each grid point
    const s21 = Array.from(grid.freqs, (_, k) => 10 * Math.log10(buf.s[(k * 4 + 2) * 2] ** 2 + buf.s[(k * 4 + 2) * 2 + 1] ** 2));
    expect(series.s21_db).toHaveLength(grid.freqs.length);
    series.s21_db.forEach((v: number, k: number) => expect(v).toBeCloseTo(s21[k], 9));
  });

  it("the lean-results migration removes the top-level copies from a row stored the old way and keeps the rest", async () => {
    const { RunResultRow } = await import("../../server/entities");
    const { migrations } = await import("../../server/migrations");
    const repo = t.ctx.dataSource.getRepository(RunResultRow);
    const lean = (await repo.findOneByOrFail({ runId })).result;
    const other = await insertRun(t, user, "done", TRIALS);
    const old = { ...lean, freqs: lean.envelopes && (lean.envelopes as { freqs: number[] }).freqs, nominal: { s21: [1, 2, 3] } };
    await repo.save(repo.create({ runId: other.id, result: old }));
    const runner = t.ctx.dataSource.createQueryRunner();
    try {
      await new (migrations.find((m) => m.name === "LeanResults1764900000000")!)().up(runner);
    } finally {
      await runner.release();
    }
    expect((await repo.findOneByOrFail({ runId: other.id })).result).toEqual(lean);
    expect((await repo.findOneByOrFail({ runId })).result).toEqual(lean); // a lean row is left as it is
  });

  it("reports lot economics and mails the launcher", async () => {
    const y = detail.run.yield;
    expect(detail.economics).toEqual({ lotSize: 500, bomCost: 0, expectedGood: 500 * y, scrapUnits: 500 - 500 * y, scrapCost: 0, costPerGoodUnit: 0 });
    const mail = (await t.outbox()).find((m) => m.to.includes(user.email));
    expect(mail?.subject).toBe(`Run finished: Harmonic low-pass r1 — yield ${(100 * y).toFixed(1)} %`);
    expect(mail?.text).toContain(`/runs/${runId}`);
  });
});

describe("grade and tolerance overrides", () => {
  it("apply to a copy of the netlist, set part.grade and sum the BOM cost", async () => {
    const grades = t.ctx.dataSource.getRepository(Grade);
    await grades.save([
      grades.create({ id: randomUUID(), kind: "C", code: "C-2", label: "±2 % C0G", tolerance: 0.02, toleranceAbs: null, distribution: "uniform", costEach: 0.03 }),
      grades.create({ id: randomUUID(), kind: "L", code: "L-2", label: "±2 % wirewound", tolerance: 0.02, toleranceAbs: null, distribution: "normal", costEach: 0.25 }),
    ]);
    const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({
      revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 50, gradeOverrides: { C1: "C-2", L2: "L-2" },
      toleranceOverrides: { C3: { tolerance: 0.1 } }, label: "what if C3 ±10 %",
    }).expect(201);
    expect(Number.isInteger(res.body.run.seed)).toBe(true); // random when absent, and returned
    expect(res.body.run).toMatchObject({ label: "what if C3 ±10 %", bomCost: 0.03 + 0.25 }); // [C] 0.03 (C1) + 0.25 (L2); C3 has no grade
    expect(["queued", "running", "done"]).toContain(res.body.run.state);
    await t.ctx.runQueue.idle();
    const got = (await agent.get(`/api/runs/${res.body.run.id}`).expect(200)).body.run;
    expect(got.netlist.parts).toEqual([
      { ...LOWPASS.parts[0], tolerance: 0.02, distribution: "uniform", grade: "C-2" },
      { ...LOWPASS.parts[1], tolerance: 0.02, distribution: "normal", grade: "L-2" },
      { ...LOWPASS.parts[2], tolerance: 0.1 },
    ]);
    expect(got.gradeOverrides).toEqual({ C1: "C-2", L2: "L-2" });
    expect(got.state).toBe("done");
  });

  it("answers 400 naming the override for an unknown part or grade", async () => {
    const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 5, gradeOverrides: { C9: "C-2", L2: "X" } }).expect(400);
    expect(res.body.error.fields).toEqual({ "gradeOverrides.C9": "no part C9 in this revision", "gradeOverrides.L2": 'no L grade "X" in the catalogue' });
  });
});

describe("bad requests", () => {
  it("answers 400 with field paths for a bad body", async () => {
    const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: "nope", trials: 0, seed: -1, corners: [], extra: 1 }).expect(400);
    for (const k of ["revisionId", "limitSetId", "trials", "seed", "corners"]) expect(res.body.error.fields).toHaveProperty([k]);
    expect(res.body.error.code).toBe("VALIDATION_FAILED");
  });

  it("answers 404 for an unknown revision and 400 for a limit set of another design", async () => {
    await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: randomUUID(), limitSetId: f.limitSet.id, trials: 5 }).expect(404);
    const other = await makeRunFixture(t, user);
    const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: other.limitSet.id, trials: 5 }).expect(400);
    expect(res.body.error.fields).toEqual({ limitSetId: "belongs to another design" });
  });

  it("answers 400 naming `index` for a trial beyond the run, and 409 when cancelling a finished run", async () => {
    const res = await agent.get(`/api/runs/${runId}/trials/${TRIALS}`).expect(400);
    expect(res.body.error.fields).toEqual({ index: `must be a trial number 0..${TRIALS - 1}` });
    await agent.get(`/api/runs/${runId}/trials/abc`).expect(400);
    const c = await agent.post(`/api/runs/${runId}/cancel`).set("Origin", ORIGIN).expect(409);
    expect(c.body.error.code).toBe("RUN_FINISHED");
  });
});

describe("replay and exports", () => {
  it("replays a trial equal to the engine's replayTrial", async () => {
    const index = detail.result.failingTrials[0];
    const got = (await agent.get(`/api/runs/${runId}/trials/${index}`).expect(200)).body.trial;
    // [C] replayed by the engine in this thread
    const want = replayTrial(LOWPASS, LOWPASS_LIMITS, { sweep: LOWPASS_SWEEP }, SEED, index);
    expect(got.pass).toBe(false);
    expect(got.parts).toEqual(want.parts.map((p, k) => ({ ...p, kind: LOWPASS.parts[k].kind })));
    expect(got.margins.map((m: any) => m.margin)).toEqual(want.margins);
    expect(got.margins.map((m: any) => m.label)).toEqual(["passband", "stopband"]);
    expect(got.freqs).toEqual(want.freqs);
    expect(got.sDb.s21).toEqual(want.corners[0].sDb.s21_db);
    expect(got.gdNs).toEqual(want.corners[0].gd21Ns);
  });

  it("streams the trials CSV: columns, one row per trial equal to the replay", async () => {
    const res = await agent.get(`/api/runs/${runId}/trials.csv`).buffer(true).parse(textParser).expect(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv/);
    expect(res.headers["content-length"]).toBeUndefined(); // written in slices, not as one body
    expect(res.headers["content-disposition"]).toMatch(/^attachment/);
    const lines = (res.body as string).trimEnd().split("\n");
    expect(lines[0]).toBe("trial,C1,L2,C3,margin passband,margin stopband,pass");
    expect(lines.length).toBe(TRIALS + 1);
    for (const index of [0, 17, detail.result.failingTrials[0], TRIALS - 1]) {
      const want = replayTrial(LOWPASS, LOWPASS_LIMITS, { sweep: LOWPASS_SWEEP }, SEED, index);
      const cells = lines[index + 1].split(",");
      expect(cells.map((c, k) => (k === 6 ? c : Number(c)))).toEqual([index, ...want.parts.map((p) => p.value), ...want.margins, String(want.pass)]);
    }
    const passes = lines.slice(1).filter((l) => l.endsWith(",true")).length;
    expect(passes).toBe(detail.run.passed);
    const negative = lines.slice(1).find((l) => l.endsWith(",false"))!;
    expect(negative).toMatch(/,-\d/); // a negative margin is a plain number, not neutralised
  });

  it("neutralises text cells starting with = + - @", async () => {
    const netlist = { ...LOWPASS, parts: LOWPASS.parts.map((p, k) => (k === 1 ? { ...p, ref: "-L2" } : p)) };
    const g = await makeRunFixture(t, user, { netlist, limits: { rules: [{ ...LOWPASS_LIMITS.rules[0], label: "=1+1,x" }] } });
    const launched = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: g.revision.id, limitSetId: g.limitSet.id, trials: 3, seed: 1 }).expect(201);
    await t.ctx.runQueue.idle();
    const res = await agent.get(`/api/runs/${launched.body.run.id}/trials.csv`).buffer(true).parse(textParser).expect(200);
    expect((res.body as string).split("\n")[0]).toBe(`trial,C1,'-L2,C3,"margin =1+1,x",pass`);
  });

  it("refuses a CSV of more than 100,000 trials, naming the limit", async () => {
    const big = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 200_000 }).expect(201);
    await agent.post(`/api/runs/${big.body.run.id}/cancel`).set("Origin", ORIGIN).expect(200);
    const res = await agent.get(`/api/runs/${big.body.run.id}/trials.csv`).expect(400);
    expect(res.body.error.message).toContain("100000");
  });

  it("exports the nominal response as .s2p that parses back to the solver's S", async () => {
    const res = await agent.get(`/api/runs/${runId}/nominal.s2p`).buffer(true).parse(textParser).expect(200);
    expect(res.headers["content-disposition"]).toMatch(/^attachment; filename=".*nominal\.s2p"$/);
    const data = parseTouchstone(res.body, { fileName: "nominal.s2p" });
    const compiled = compileNetlist(LOWPASS);
    const grid = buildFrequencyGrid(LOWPASS_SWEEP, validateLimits(LOWPASS_LIMITS, 2));
    const buf = createSweepEvaluator(compiled, grid.freqs).evaluate(nominalValues(compiled), 25);
    expect(data.ports).toBe(2);
    expect(data.z0).toEqual([50, 50]);
    expect(data.freqs.length).toBe(grid.freqs.length);
    expect(data.s.length).toBe(buf.s.length);
    data.freqs.forEach((fr, k) => expect(fr).toBeCloseTo(grid.freqs[k], 0)); // written as GHz with full precision
    // 12 significant digits in the file (writeTouchstone) → ≤ ~1e-11 absolute on |S| ≤ 1
    data.s.forEach((v, k) => expect(Math.abs(v - buf.s[k])).toBeLessThan(1e-10));
  });

  it("exports a trial as .s2p whose |S21| matches the replay", async () => {
    const res = await agent.get(`/api/runs/${runId}/trials/5.s2p`).buffer(true).parse(textParser).expect(200);
    const data = parseTouchstone(res.body, { fileName: "t.s2p" });
    const want = replayTrial(LOWPASS, LOWPASS_LIMITS, { sweep: LOWPASS_SWEEP }, SEED, 5);
    const s21 = Array.from(data.freqs, (_, k) => 10 * Math.log10(data.s[(k * 4 + 2) * 2] ** 2 + data.s[(k * 4 + 2) * 2 + 1] ** 2));
    // 12 significant digits of magnitude → ≤ 1e-10 dB
    expect(s21.length).toBe(want.corners[0].sDb.s21_db.length);
    expect(s21.length).toBeGreaterThan(10);
    s21.forEach((db, k) => expect(Math.abs(db - want.corners[0].sDb.s21_db[k])).toBeLessThan(1e-9));
  });
});
