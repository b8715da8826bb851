import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DesignRevision, ReviewEvent } from "../../server/entities";
import { migrations } from "../../server/migrations";
import { createTestContext, type TestContext } from "../helpers/test-context";
import { makeDesign } from "./access-samples/reviews";

// The sign-off words replaced the old review states in stored rows: a revision and its trail written with the old words
// read back in the new ones.

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

describe("migration SignoffWords1764903600000", () => {
  it("renames stored review states and trail steps, and leaves drafts alone", async () => {
    const owner = await t.buildUser({ roles: ["designer", "reviewer"] });
    const old = { inReview: await makeDesign(t, owner), approved: await makeDesign(t, owner), back: await makeDesign(t, owner), draft: await makeDesign(t, owner) };
    const revisions = t.ctx.dataSource.getRepository(DesignRevision);
    const write = (id: string, state: string) => t.ctx.dataSource.query("UPDATE `design_revision` SET `review_state` = ? WHERE `id` = ?", [state, id]);
    await write(old.inReview.revision.id, "in-review");
    await write(old.approved.revision.id, "approved");
    await write(old.back.revision.id, "changes-requested");
    await t.ctx.dataSource.query("INSERT INTO `review_event` (`id`, `revision_id`, `actor_id`, `from_state`, `to_state`, `comment`) VALUES (?, ?, ?, 'in-review', 'approved', 'ok')", [randomUUID(), old.approved.revision.id, owner.id]);
    const runner = t.ctx.dataSource.createQueryRunner();
    try {
      await new (migrations.find((m) => m.name === "SignoffWords1764903600000")!)().up(runner);
    } finally {
      await runner.release();
    }
    const state = async (id: string) => (await revisions.findOneByOrFail({ id })).reviewState;
    expect(await state(old.inReview.revision.id)).toBe("awaiting-signoff");
    expect(await state(old.approved.revision.id)).toBe("signed-off");
    expect(await state(old.back.revision.id)).toBe("returned");
    expect(await state(old.draft.revision.id)).toBe("draft");
    const [step] = await t.ctx.dataSource.getRepository(ReviewEvent).findBy({ revisionId: old.approved.revision.id });
    expect([step.fromState, step.toState]).toEqual(["awaiting-signoff", "signed-off"]);
  });
});
