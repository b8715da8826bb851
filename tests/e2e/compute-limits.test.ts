import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ARTIFACTS, signedInPage, startE2e, type E2e } from "../helpers/browser";

// End to end in Debian's Chromium: the admin lowers the compute limit on the Team screen (at 1440×900 and 390×844),
// and an analyst's launch over it is refused in the launch form with the most trials that circuit may have.
// Screenshots go to tests/artifacts/e2e (git-ignored).

let e: E2e;
beforeAll(async () => {
  e = await startE2e();
}, 90_000);
afterAll(() => e?.close());

describe("compute limits in the browser", () => {
  it("the admin sets the run limit; a run over it is refused in the launch form, naming the most trials", async () => {
    const admin = await signedInPage(e, "admin");
    await admin.getByRole("link", { name: "Team" }).click();
    const field = admin.getByLabel("Most a run may cost");
    await field.waitFor();
    expect(await field.inputValue()).toBe("2e10");
    await field.fill("banana");
    await admin.getByRole("button", { name: "Save limits" }).click();
    await expect.poll(() => field.getAttribute("aria-invalid")).toBe("true");
    await field.fill("3M"); // SI prefixes read as numbers: 3 000 000 part evaluations
    await admin.getByRole("button", { name: "Save limits" }).click();
    await admin.getByText("Compute limits saved.").waitFor();
    await admin.screenshot({ path: `${ARTIFACTS}/admin-compute-limits-1440.png`, fullPage: true });
    const stored = await admin.evaluate(() => fetch("/api/settings/compute-limits").then((r) => r.json()));
    expect(stored.limits.maxRunCost).toBe(3e6);

    await admin.setViewportSize({ width: 390, height: 844 });
    await admin.reload();
    await admin.getByLabel("Most a run may cost").waitFor();
    await admin.getByLabel("Most a run may cost").scrollIntoViewIfNeeded();
    await admin.screenshot({ path: `${ARTIFACTS}/admin-compute-limits-390.png`, fullPage: true });
    // the compute limits card itself fits the phone's width (the Team screen's members table scrolls inside its own box)
    const card = admin.locator("section", { has: admin.getByRole("heading", { name: "Compute limits", exact: true }) }).last();
    const box = await card.boundingBox();
    expect(box!.x).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width).toBeLessThanOrEqual(390);

    const page = await signedInPage(e, "analyst");
    await page.getByRole("link", { name: "Runs", exact: true }).click();
    await page.getByRole("link", { name: "New run" }).click();
    await page.getByLabel("Limit set").locator("option").first().waitFor({ state: "attached" });
    await page.getByLabel("Trials").fill("100000");
    await page.getByRole("button", { name: "Launch run" }).click();
    const message = page.getByText(/at most \d+ trials for this circuit/).first();
    await message.waitFor({ timeout: 15_000 });
    await page.screenshot({ path: `${ARTIFACTS}/analyst-run-too-costly.png`, fullPage: true });
    expect(await page.getByRole("progressbar", { name: "Trials done" }).count()).toBe(0);
  }, 90_000);
});
