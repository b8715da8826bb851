import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { User } from "../../server/entities";
import { ARTIFACTS, person, signedInPage, startE2e, type E2e } from "../helpers/browser";
import { makeRunFixture } from "../integration/access-samples/runs";

// Issue 11, item 5: launching a run locks the revision it runs, and the client cache must know it at once. A designer
// opens r1, goes to New run, launches, and comes back (well within the cache's 30 s freshness): the page must offer
// only "Save as new revision", and saving must make r2, never the 409 REVISION_LOCKED an overwrite of r1 gets.

let e: E2e;
beforeAll(async () => {
  e = await startE2e({ demoDesigns: false });
}, 90_000);
afterAll(() => e?.close());

describe("the revision cache after a launch", () => {
  it("open r1 → New run → Launch → back → the locked r1 offers only a new revision, and saving makes r2", async () => {
    const designer = await e.t.ctx.dataSource.getRepository(User).findOneByOrFail({ email: person("designer").email });
    const { design, revision } = await makeRunFixture(e.t, designer, { name: "Cache low-pass" });
    const page = await signedInPage(e, "designer");
    const saves: number[] = [];
    page.on("response", (res) => {
      if (/\/api\/(revisions\/[^/]+|designs\/[^/]+\/revisions)$/.test(new URL(res.url()).pathname) && res.request().method() !== "GET") saves.push(res.status());
    });

    await page.goto(`${e.base}/designs/${design.id}?revision=${revision.id}`);
    await page.getByRole("heading", { name: "Cache low-pass" }).waitFor();
    await page.getByRole("button", { name: "Save r1" }).waitFor(); // r1 is not locked yet: it may be overwritten

    await page.getByRole("link", { name: "Runs", exact: true }).click();
    await page.getByRole("link", { name: "New run" }).click();
    await page.getByLabel("Limit set").locator("option").first().waitFor({ state: "attached" });
    await expect.poll(() => page.getByLabel("Revision").locator("option:checked").textContent()).toContain("r1");
    await page.getByLabel("Trials").fill("50");
    await page.getByLabel("Seed").fill("11");
    await page.getByRole("button", { name: "Launch run" }).click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);

    await page.goBack(); // New run
    await page.getByRole("button", { name: "Launch run" }).waitFor();
    await page.goBack(); // Runs
    await page.getByRole("heading", { name: "Runs", exact: true }).waitFor();
    await page.goBack(); // the design at r1, a few seconds after it was first shown
    await page.getByRole("heading", { name: "Cache low-pass" }).waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/revision-cache-back.png`, fullPage: true });
    await page.getByText("A run uses r1").waitFor({ timeout: 5000 });
    expect(await page.getByRole("button", { name: "Save r1" }).count()).toBe(0);

    await page.getByLabel("Value, row 1").fill("33p");
    await page.getByRole("button", { name: "Save as new revision" }).click();
    await expect.poll(() => page.getByLabel("Revision").locator("option:checked").textContent()).toContain("r2");
    await page.screenshot({ path: `${ARTIFACTS}/revision-cache-r2.png`, fullPage: true });
    expect(await page.getByText("This revision is locked").count()).toBe(0);
    expect(saves).toEqual([201]);
    expect(e.foreign).toEqual([]);
  }, 120_000);
});
