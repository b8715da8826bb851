import { existsSync, mkdirSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { User } from "../../server/entities";
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { seedDemoDesigns, type DemoDesignsSummary } from "../../server/seed/demo-designs";
import { createTestContext, type TestContext } from "../helpers/test-context";
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

// SET-UP (kept the same in the analyst and reviewer browser tests):  a private database with the demo people, designs,
// limit sets and grade catalogue; the real app on a loopback port; Debian's Chromium.

const ARTIFACTS = "tests/artifacts/e2e";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
  "--disable-background-networking", "--disable-component-update", "--disable-sync"];

type E2e = { t: TestContext; base: string; browser: Browser; demo: DemoDesignsSummary; foreign: string[]; close(): Promise<void> };

async function startE2e(): Promise<E2e> {
  // LOTWISE_CLIENT_DIR lets a test run serve a private build while others rebuild dist/client.
  const clientDir = process.env.LOTWISE_CLIENT_DIR ?? "dist/client";
  if (!existsSync(`${clientDir}/index.html`)) throw new Error(`The client is not built in ${clientDir}: run \`npx vite build\` first.`);
  mkdirSync(ARTIFACTS, { recursive: true });
  const t = await createTestContext();
  await seedDemo(t.ctx.dataSource);
  const users = t.ctx.dataSource.getRepository(User);
  const designer = await users.findOneByOrFail({ email: person("designer").email });
  const planner = await users.findOneByOrFail({ email: person("planner").email });
  const demo = await seedDemoDesigns(t.ctx.dataSource, { designer: designer.id, planner: planner.id });
  const server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(0, "127.0.0.1", () => resolve(s));
  });
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  t.ctx.config.publicOrigin = base;
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: CHROMIUM_ARGS });
  return {
    t, base, browser, demo, foreign: [],
    async close() {
      await browser.close();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await t.close();
    },
  };
}

/** The demo person holding a role. */
function person(role: string) {
  return DEMO_PEOPLE.find((p) => p.roles.includes(role as never))!;
}

/** A fresh browser context signed in as the demo person with this role. */
async function signedInPage(e: E2e, role: string): Promise<Page> {
  const context = await e.browser.newContext({ viewport: { width: 1360, height: 900 } });
  const page = await context.newPage();
  page.on("request", (req) => {
    if (!req.url().startsWith(e.base) && !req.url().startsWith("data:")) e.foreign.push(req.url());
  });
  page.on("response", (res) => {
    if (res.status() >= 500) console.error(`[browser] ${res.status()} ${res.url()}`);
  });
  page.on("pageerror", (err) => console.error(`[browser] ${err.message}`));
  await page.goto(`${e.base}/sign-in`);
  await page.getByLabel("E-mail").fill(person(role).email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.getByRole("button", { name: "Sign out" }).waitFor();
  return page;
}
