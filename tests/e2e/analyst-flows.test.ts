import type { Page } from "playwright-core";
import { ARTIFACTS, startE2e, signedInPage, type E2e } from "../helpers/browser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// The analyst's main tasks in Chromium: launch a run, watch the progress bar to the end, read the dashboard and
// replay a failing trial; then a grade sweep whose cost table marks the cheapest assignment meeting the target.

let e: E2e;

beforeAll(async () => {
  e = await startE2e();
}, 90_000);

afterAll(async () => {
  await e?.close();
});

/** Waits until the charts' lazy chunk has drawn at least `n` canvases. */
async function chartsDrawn(page: Page, n: number) {
  await page.waitForFunction((count) => document.querySelectorAll("canvas").length >= count, n, { timeout: 20_000 });
  await page.waitForTimeout(400);
}

/** The Card (a <section>) whose heading is `title`. */
const card = (page: Page, title: string) => page.locator("section", { has: page.getByRole("heading", { name: title, exact: true }) }).last();

describe("analyst in the browser", () => {
  it("launches a run, watches it finish and opens the dashboard and a failing trial", async () => {
    const page = await signedInPage(e, "analyst");
    await page.getByRole("link", { name: "Runs", exact: true }).click();
    await page.getByRole("link", { name: "New run" }).click();
    await page.getByLabel("Limit set").locator("option").first().waitFor({ state: "attached" });
    await page.getByLabel("Trials").fill("8000");
    await page.getByLabel("Seed").fill("20260611");
    await page.getByLabel("Grade for L1").waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/analyst-1-new-run.png`, fullPage: true });
    await page.getByRole("button", { name: "Launch run" }).click();

    const bar = page.getByRole("progressbar", { name: "Trials done" });
    await bar.waitFor({ timeout: 15_000 });
    await expect.poll(async () => Number(await bar.getAttribute("aria-valuenow")), { timeout: 30_000 }).toBeGreaterThan(0);
    await page.screenshot({ path: `${ARTIFACTS}/analyst-2-progress.png` });

    const yieldValue = page.getByTestId("yield-value");
    await yieldValue.waitFor({ timeout: 120_000 });
    expect(await yieldValue.textContent()).toMatch(/^\d{1,3}\.\d %$/);
    await expect.poll(() => bar.count()).toBe(0);
    await page.getByText("95 % interval (Wilson)").waitFor();
    await page.getByRole("img", { name: /Transmission \|S21\| percentile envelope/ }).waitFor();
    await chartsDrawn(page, 4);
    await page.screenshot({ path: `${ARTIFACTS}/analyst-3-dashboard.png`, fullPage: true });
    await card(page, "Response spread").screenshot({ path: `${ARTIFACTS}/analyst-3b-spread.png` });
    await card(page, "Failures by rule").screenshot({ path: `${ARTIFACTS}/analyst-3c-pareto.png` });
    expect(await page.getByText("cost per good unit").count()).toBeGreaterThan(0);
    expect(await page.getByRole("link", { name: "Trials CSV" }).getAttribute("href")).toMatch(/\/api\/runs\/.+\/trials\.csv$/);

    const firstFailing = page.getByRole("list", { name: "Failing trials" }).getByRole("link").first();
    if ((await firstFailing.count()) > 0) {
      await firstFailing.click();
      await page.getByText("Part values").first().waitFor();
      await chartsDrawn(page, 2);
      await page.screenshot({ path: `${ARTIFACTS}/analyst-4-trial.png`, fullPage: true });
      await page.getByRole("link", { name: "Back to the run" }).click();
    }
    await page.getByRole("link", { name: "Report" }).click();
    await page.getByText("Lotwise run report").waitFor();
    await chartsDrawn(page, 2);
    await page.screenshot({ path: `${ARTIFACTS}/analyst-5-report.png`, fullPage: true });
    await page.emulateMedia({ media: "print" });
    await page.screenshot({ path: `${ARTIFACTS}/analyst-5b-report-print.png`, fullPage: true });
    expect(await page.locator("aside").isVisible()).toBe(false);
    await page.emulateMedia({ media: "screen" });
    expect(e.foreign).toEqual([]);
  }, 180_000);

  it("runs a grade sweep and sees the cost table with the cheapest assignment marked", async () => {
    const page = await signedInPage(e, "analyst");
    await page.getByRole("link", { name: "Runs", exact: true }).click();
    await page.getByRole("heading", { name: "Runs", exact: true }).waitFor();
    await page.getByRole("link", { name: "New grade sweep" }).click();
    await page.getByLabel("Label of assignment 1").waitFor();
    await page.getByLabel("Trials per assignment").fill("1500");
    await page.getByLabel("Target yield (%)").fill("80");
    await page.getByLabel("Sweep name (optional)").fill("Preselector grade choice");
    await page.screenshot({ path: `${ARTIFACTS}/analyst-6-new-sweep.png`, fullPage: true });
    await page.getByRole("button", { name: "Launch sweep" }).click();

    await page.getByRole("heading", { name: "Preselector grade choice" }).waitFor({ timeout: 15_000 });
    await page.getByRole("heading", { name: "Cost table" }).waitFor();
    await expect.poll(() => page.getByText(/still going/).count(), { timeout: 150_000, interval: 1000 }).toBe(0);
    const rows = page.getByRole("table", { name: "Grade sweep results" }).locator("tbody tr");
    expect(await rows.count()).toBeGreaterThan(1);
    const cheapest = page.locator("tr[data-cheapest]");
    await expect.poll(() => cheapest.count()).toBe(1);
    expect(await cheapest.getByText("cheapest meeting target").count()).toBe(1);
    await page.screenshot({ path: `${ARTIFACTS}/analyst-7-sweep.png`, fullPage: true });

    await page.getByRole("link", { name: "Compare these runs" }).click();
    await page.getByRole("table", { name: "Runs side by side" }).waitFor({ timeout: 15_000 });
    await chartsDrawn(page, 3);
    await page.screenshot({ path: `${ARTIFACTS}/analyst-8-compare.png`, fullPage: true });
    expect(e.foreign).toEqual([]);
  }, 240_000);
});
