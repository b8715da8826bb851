import { ARTIFACTS, startE2e, signedInPage, type E2e } from "../helpers/browser";
import { ORIGIN } from "../helpers/test-context";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// The reviewer's main task in Chromium: find a finished run in the history, comment on it, sign its revision off.
// The run and the submission for sign-off are made through the API first (as an analyst and a designer would).

let e: E2e;
let runId: string;

beforeAll(async () => {
  e = await startE2e();
  const design = e.demo.designs.find((d) => d.name === "VHF harmonic low-pass")!;
  const { agent: analyst } = await e.t.signedInAgent(["analyst"]);
  const created = await analyst.post("/api/runs").set("Origin", ORIGIN)
    .send({ revisionId: design.revisionId, limitSetId: design.limitSetIds[0], trials: 600, seed: 4242, label: "release check" }).expect(201);
  runId = created.body.run.id;
  for (let k = 0; k < 120; k++) {
    const { body } = await analyst.get(`/api/runs/${runId}`).expect(200);
    if (body.run.state === "done") break;
    if (body.run.state === "failed") throw new Error(`seed run failed: ${body.run.errorMessage}`);
    await new Promise((r) => setTimeout(r, 500));
  }
  const { agent: designer } = await e.t.signedInAgent(["designer"]);
  // A transmitter output filter: the dashboard must show the stronger high-power caution.
  await designer.patch(`/api/designs/${design.designId}`).set("Origin", ORIGIN).send({ stress: "high-power-rf" }).expect(200);
  await designer.post(`/api/revisions/${design.revisionId}/review`).set("Origin", ORIGIN).send({ action: "submit", comment: "ready for release" }).expect(200);
}, 120_000);

afterAll(async () => {
  await e?.close();
});

describe("reviewer in the browser", () => {
  it("finds the run in the history, comments and signs the revision off", async () => {
    const page = await signedInPage(e, "reviewer");
    await page.getByRole("link", { name: "Runs", exact: true }).click();
    const table = page.getByRole("table", { name: "Run history" });
    await table.waitFor();
    expect(await page.getByRole("link", { name: "New run" }).count()).toBe(0); // a reviewer launches nothing
    await page.getByLabel("State").selectOption("done");
    await page.waitForURL(/state=done/);
    await table.getByRole("link", { name: "release check" }).waitFor();
    await page.getByRole("button", { name: /yield/ }).click();
    await page.waitForURL(/sort=yield/);
    await page.screenshot({ path: `${ARTIFACTS}/reviewer-1-history.png`, fullPage: true });

    await table.getByRole("link", { name: "release check" }).click();
    await page.getByTestId("yield-value").waitFor({ timeout: 15_000 });
    await page.getByText("awaiting sign-off").first().waitFor();
    expect(await page.getByRole("button", { name: "Rerun with this change" }).count()).toBe(0);
    await page.getByText("High-power RF filter: this is an estimate, not a certification").waitFor();

    await page.getByRole("textbox", { name: "Comment" }).fill("Harmonic rejection margin looks comfortable; passband match is the rule to watch.");
    await page.getByRole("button", { name: "Post comment" }).click();
    await page.getByRole("list", { name: "Comments" }).getByText("passband match is the rule to watch").waitFor();

    await page.getByLabel("Note with the decision (optional)").fill("Signed off for the first lot.");
    await page.getByRole("button", { name: "Sign off revision" }).click();
    await page.getByRole("list", { name: "Sign-off trail" }).getByText("signed off", { exact: true }).waitFor();
    expect(await page.getByRole("button", { name: "Sign off revision" }).count()).toBe(0);
    // the review speaks our own words: none of the code-hosting review wording is left on the page
    expect(await page.locator("body").innerText()).not.toMatch(/Approve|Request changes|changes requested|in review/);
    await page.waitForTimeout(500);
    await page.screenshot({ path: `${ARTIFACTS}/reviewer-2-signed-off.png`, fullPage: true });

    const { agent } = await e.t.signedInAgent(["reviewer"]);
    const design = e.demo.designs.find((d) => d.name === "VHF harmonic low-pass")!;
    const review = await agent.get(`/api/revisions/${design.revisionId}/review`).expect(200);
    expect(review.body.reviewState).toBe("signed-off");
    const comments = await agent.get(`/api/runs/${runId}/comments`).expect(200);
    expect(comments.body.comments.map((c: { body: string }) => c.body)).toEqual([expect.stringContaining("rule to watch")]);
    expect(e.foreign).toEqual([]);
  }, 90_000);
});
