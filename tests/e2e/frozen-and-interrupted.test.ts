import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run } from "../../server/entities";
import { paths } from "../../src/config/paths";
import { ARTIFACTS, signedInPage, startE2e, type E2e } from "../helpers/browser";
import { ORIGIN } from "../helpers/test-context";

// What the screens say about frozen and interrupted work, at 1440×900 and 390×844: a revision submitted for sign-off
// shows why it is kept as it is and offers only a new revision; a run a server stop interrupted says so in its facts.
// Screenshots go to tests/artifacts/e2e (git-ignored).

let e: E2e;
let runId: string;
let design: E2e["demo"]["designs"][number];

beforeAll(async () => {
  e = await startE2e();
  design = e.demo.designs.find((d) => d.name === "VHF harmonic low-pass")!;
  const { agent: designer } = await e.t.signedInAgent(["designer", "analyst"]);
  const created = await designer.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: design.revisionId, limitSetId: design.limitSetIds[0], trials: 400, seed: 7 }).expect(201);
  runId = created.body.run.id;
  await e.t.ctx.runQueue.idle();
  // As the queue writes it when a stopped server's run is queued again (run-outcomes.ts, requeueInterrupted).
  await e.t.ctx.dataSource.getRepository(Run).update({ id: runId }, { interruptions: 1, lastInterruptedAt: new Date("2026-12-04T09:30:00Z") });
  await designer.post(`/api/revisions/${design.revisionId}/review`).set("Origin", ORIGIN).send({ action: "submit" }).expect(200);
}, 120_000);
afterAll(() => e?.close());

async function at(page: Page, width: number, height: number, url: string) {
  await page.setViewportSize({ width, height });
  await page.goto(url);
}

describe("frozen and interrupted, at both sizes", () => {
  it("the workspace of a revision awaiting sign-off explains the freeze; the run page names the interruption", async () => {
    const page = await signedInPage(e, "designer");
    for (const [width, height] of [[1440, 900], [390, 844]] as const) {
      await at(page, width, height, `${e.base}${paths.app.design.getHref(design.designId, design.revisionId)}`);
      await page.getByText("frozen for sign-off").first().waitFor();
      await page.getByText(/r1 has been submitted for sign-off, so it is kept as it is/).waitFor();
      expect(await page.getByRole("button", { name: "Save r1" }).count()).toBe(0);
      expect(await page.getByRole("button", { name: "Save as new revision" }).count()).toBe(1);
      await page.screenshot({ path: `${ARTIFACTS}/frozen-revision-${width}.png`, fullPage: true });

      await at(page, width, height, `${e.base}/runs/${runId}`);
      const fact = page.getByText(/^1× \(last .*\), resumed from its seed$/);
      await fact.waitFor();
      await page.getByTestId("yield-value").waitFor({ timeout: 15_000 });
      await page.screenshot({ path: `${ARTIFACTS}/interrupted-run-${width}.png`, fullPage: false });
      // the sign-off panel at the foot of the run page, in our own words
      const panel = page.getByText(/^Revision r1 is/);
      await panel.scrollIntoViewIfNeeded();
      await page.getByText("awaiting sign-off").first().waitFor();
      await page.screenshot({ path: `${ARTIFACTS}/signoff-panel-${width}.png`, fullPage: false });
    }
  }, 90_000);
});
