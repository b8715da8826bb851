import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ReviewEvent, type User } from "../../server/entities";
import { createTestContext, ORIGIN, TEST_PASSWORD, type TestContext } from "../helpers/test-context";
import { makeDesign, makeRun } from "./access-samples/reviews";

// Run comments and the revision sign-off (draft → awaiting-signoff → signed-off | returned), with its mails.

type Agent = ReturnType<typeof request.agent>;
let t: TestContext;
let designer: { agent: Agent; user: User };
let reviewer: { agent: Agent; user: User };
let otherReviewer: User;
let inactiveReviewer: User;

async function agentFor(user: User): Promise<Agent> {
  const agent = request.agent(t.app);
  await agent.post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: TEST_PASSWORD }).expect(200);
  return agent;
}

beforeAll(async () => {
  t = await createTestContext();
  const d = await t.buildUser({ roles: ["designer"], name: "Dana Designer" });
  const r = await t.buildUser({ roles: ["reviewer"], name: "Rui Reviewer" });
  designer = { user: d, agent: await agentFor(d) };
  reviewer = { user: r, agent: await agentFor(r) };
  otherReviewer = await t.buildUser({ roles: ["reviewer", "analyst"], name: "Oona" });
  inactiveReviewer = await t.buildUser({ roles: ["reviewer"], active: false });
});
afterAll(() => t?.close());

const post = (agent: Agent, path: string) => agent.post(path).set("Origin", ORIGIN);
const mailsTo = async (user: User, subject: string) => (await t.outbox()).filter((m) => m.to.includes(user.email) && m.subject === subject);

describe("run comments", () => {
  it("adds a comment as any signed-in person and lists them oldest first with their authors", async () => {
    const run = await makeRun(t, await makeDesign(t, designer.user), designer.user);
    const first = await post(reviewer.agent, `/api/runs/${run.id}/comments`).send({ body: "  Passband edge is tight.  " }).expect(201);
    expect(first.body.comment).toMatchObject({ body: "Passband edge is tight.", author: { id: reviewer.user.id, name: "Rui Reviewer" } });
    expect(first.body.comment.id).toMatch(/^[0-9a-f-]{36}$/);
    await post(designer.agent, `/api/runs/${run.id}/comments`).send({ body: "Will try 2 % inductors." }).expect(201);
    const list = await reviewer.agent.get(`/api/runs/${run.id}/comments`).expect(200);
    expect(list.body.comments.map((c: { body: string; author: { name: string } }) => [c.author.name, c.body])).toEqual([
      ["Rui Reviewer", "Passband edge is tight."],
      ["Dana Designer", "Will try 2 % inductors."],
    ]);
  });

  it("answers 400 for an empty or too long body, 404 for an unknown run, 401 without a session", async () => {
    const run = await makeRun(t, await makeDesign(t, designer.user), designer.user);
    const empty = await post(reviewer.agent, `/api/runs/${run.id}/comments`).send({ body: "   " }).expect(400);
    expect(empty.body.error).toMatchObject({ code: "VALIDATION_FAILED", fields: { body: "body must not be empty" } });
    const long = await post(reviewer.agent, `/api/runs/${run.id}/comments`).send({ body: "x".repeat(4001) }).expect(400);
    expect(long.body.error.fields).toEqual({ body: "body is at most 4000 characters" });
    await post(reviewer.agent, "/api/runs/3b241101-e2bb-4255-8caf-4136c566a962/comments").send({ body: "hello" }).expect(404);
    await reviewer.agent.get("/api/runs/3b241101-e2bb-4255-8caf-4136c566a962/comments").expect(404);
    await request(t.app).post(`/api/runs/${run.id}/comments`).set("Origin", ORIGIN).send({ body: "hi" }).expect(401);
  });
});

describe("revision review", () => {
  it("goes draft → awaiting-signoff → signed-off, storing each step and mailing the people involved", async () => {
    const f = await makeDesign(t, designer.user, { name: "Preselector" });
    const path = `/api/revisions/${f.revision.id}/review`;
    expect((await reviewer.agent.get(path).expect(200)).body).toEqual({ reviewState: "draft", events: [] });

    const asked = await post(designer.agent, path).send({ action: "submit", comment: "Ready for a look." }).expect(200);
    expect(asked.body.reviewState).toBe("awaiting-signoff");
    // every active reviewer hears of it, the inactive one does not
    for (const r of [reviewer.user, otherReviewer]) {
      const [mail] = await mailsTo(r, "Sign-off requested: Preselector r1");
      expect(mail.text).toContain("Dana Designer submits Preselector, revision 1, for sign-off.");
      expect(mail.text).toContain("> Ready for a look.");
      expect(mail.text).toContain(`${ORIGIN}/designs/${f.design.id}?revision=${f.revision.id}`);
    }
    expect(await mailsTo(inactiveReviewer, "Sign-off requested: Preselector r1")).toEqual([]);

    const approved = await post(reviewer.agent, path).send({ action: "sign-off", comment: "Margins fine." }).expect(200);
    expect(approved.body.reviewState).toBe("signed-off");
    expect(approved.body.events.map((e: { fromState: string; toState: string; actor: { name: string }; comment: string }) => [e.fromState, e.toState, e.actor.name, e.comment])).toEqual([
      ["draft", "awaiting-signoff", "Dana Designer", "Ready for a look."],
      ["awaiting-signoff", "signed-off", "Rui Reviewer", "Margins fine."],
    ]);
    expect(await t.ctx.dataSource.getRepository(ReviewEvent).countBy({ revisionId: f.revision.id })).toBe(2);
    const [decided] = await mailsTo(designer.user, "Signed off: Preselector r1");
    expect(decided.text).toContain("Rui Reviewer signed off Preselector, revision 1.");
    expect(await mailsTo(reviewer.user, "Signed off: Preselector r1")).toEqual([]); // not to the reviewer themself
    expect((await designer.agent.get(path).expect(200)).body.reviewState).toBe("signed-off");
  });

  it("returns it for rework, then it may be submitted again; the submitter is mailed too", async () => {
    const f = await makeDesign(t, designer.user, { name: "Notch" });
    const path = `/api/revisions/${f.revision.id}/review`;
    const second = await t.buildUser({ roles: ["designer"], name: "Sam Second" });
    const secondAgent = await agentFor(second);
    await post(secondAgent, path).send({ action: "submit" }).expect(200);
    const back = await post(reviewer.agent, path).send({ action: "return", comment: "C3 at ±10 % fails the stopband." }).expect(200);
    expect(back.body.reviewState).toBe("returned");
    for (const u of [designer.user, second]) {
      const [mail] = await mailsTo(u, "Returned for rework: Notch r1");
      expect(mail.text).toContain("Rui Reviewer returned for rework Notch, revision 1.");
      expect(mail.text).toContain("> C3 at ±10 % fails the stopband.");
    }
    expect((await post(designer.agent, path).send({ action: "submit" }).expect(200)).body.reviewState).toBe("awaiting-signoff");
    expect((await designer.agent.get(path).expect(200)).body.events).toHaveLength(3);
  });

  it("lets only a reviewer decide and only a designer ask (403 with a clear message), planners not at all", async () => {
    const f = await makeDesign(t, designer.user);
    const path = `/api/revisions/${f.revision.id}/review`;
    const asReviewerAsking = await post(reviewer.agent, path).send({ action: "submit" }).expect(403);
    expect(asReviewerAsking.body.error).toEqual({ code: "FORBIDDEN", message: "Only a designer can submit a revision for sign-off." });
    await post(designer.agent, path).send({ action: "submit" }).expect(200);
    for (const action of ["sign-off", "return"]) {
      const res = await post(designer.agent, path).send({ action }).expect(403);
      expect(res.body.error.code).toBe("FORBIDDEN");
      expect(res.body.error.message).toMatch(/^Only a reviewer can (sign a revision off|return a revision for rework)\.$/);
    }
    const planner = await t.signedInAgent(["planner"]);
    expect((await post(planner.agent, path).send({ action: "sign-off" }).expect(403)).body.error.message).toBe("This needs the designer or reviewer role.");
    await request(t.app).post(path).set("Origin", ORIGIN).send({ action: "sign-off" }).expect(401);
    // someone holding both roles may do both
    const both = await t.signedInAgent(["designer", "reviewer"]);
    expect((await post(both.agent, path).send({ action: "sign-off" }).expect(200)).body.reviewState).toBe("signed-off");
  });

  it("answers 409 REVIEW_STATE on a wrong transition, and stores nothing", async () => {
    const f = await makeDesign(t, designer.user);
    const path = `/api/revisions/${f.revision.id}/review`;
    const early = await post(reviewer.agent, path).send({ action: "sign-off" }).expect(409);
    expect(early.body.error).toEqual({ code: "REVIEW_STATE", message: "This revision is draft; to sign it off it must be awaiting sign-off." });
    await post(designer.agent, path).send({ action: "submit" }).expect(200);
    expect((await post(designer.agent, path).send({ action: "submit" }).expect(409)).body.error.message).toBe(
      "This revision is awaiting sign-off; to submit it for sign-off it must be draft or returned for rework.",
    );
    await post(reviewer.agent, path).send({ action: "sign-off" }).expect(200);
    await post(reviewer.agent, path).send({ action: "return" }).expect(409);
    await post(designer.agent, path).send({ action: "submit" }).expect(409);
    expect(await t.ctx.dataSource.getRepository(ReviewEvent).countBy({ revisionId: f.revision.id })).toBe(2);
  });

  it("answers 400 for an unknown action or a long comment, 404 for an unknown revision", async () => {
    const f = await makeDesign(t, designer.user);
    const path = `/api/revisions/${f.revision.id}/review`;
    const bad = await post(designer.agent, path).send({ action: "merge" }).expect(400);
    expect(bad.body.error.fields).toEqual({ action: "action must be one of submit, sign-off, return" });
    const long = await post(designer.agent, path).send({ action: "submit", comment: "y".repeat(2001) }).expect(400);
    expect(Object.keys(long.body.error.fields)).toEqual(["comment"]);
    await post(designer.agent, "/api/revisions/3b241101-e2bb-4255-8caf-4136c566a962/review").send({ action: "submit" }).expect(404);
    await designer.agent.get("/api/revisions/3b241101-e2bb-4255-8caf-4136c566a962/review").expect(404);
  });
});
