import { existsSync, mkdirSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { User } from "../../server/entities";
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { seedDemoDesigns, type DemoDesignsSummary } from "../../server/seed/demo-designs";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// The reviewer's main task in Chromium: find a finished run in the history, comment on it, approve its revision.
// The run and the review request are made through the API first (as an analyst and a designer would).

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
  await designer.post(`/api/revisions/${design.revisionId}/review`).set("Origin", ORIGIN).send({ action: "request", comment: "ready for release" }).expect(200);
}, 120_000);

afterAll(async () => {
  await e?.close();
});

describe("reviewer in the browser", () => {
  it("finds the run in the history, comments and approves the revision", async () => {
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
    await page.getByText("in review").first().waitFor();
    expect(await page.getByRole("button", { name: "Rerun with this change" }).count()).toBe(0);
    await page.getByText("High-power RF filter: this is an estimate, not a certification").waitFor();

    await page.getByRole("textbox", { name: "Comment" }).fill("Harmonic rejection margin looks comfortable; passband match is the rule to watch.");
    await page.getByRole("button", { name: "Post comment" }).click();
    await page.getByRole("list", { name: "Comments" }).getByText("passband match is the rule to watch").waitFor();

    await page.getByLabel("Note with the decision (optional)").fill("Approved for the first lot.");
    await page.getByRole("button", { name: "Approve revision" }).click();
    await page.getByRole("list", { name: "Review trail" }).getByText("approved", { exact: true }).waitFor();
    expect(await page.getByRole("button", { name: "Approve revision" }).count()).toBe(0);
    await page.waitForTimeout(500);
    await page.screenshot({ path: `${ARTIFACTS}/reviewer-2-approved.png`, fullPage: true });

    const { agent } = await e.t.signedInAgent(["reviewer"]);
    const design = e.demo.designs.find((d) => d.name === "VHF harmonic low-pass")!;
    const review = await agent.get(`/api/revisions/${design.revisionId}/review`).expect(200);
    expect(review.body.reviewState).toBe("approved");
    const comments = await agent.get(`/api/runs/${runId}/comments`).expect(200);
    expect(comments.body.comments.map((c: { body: string }) => c.body)).toEqual([expect.stringContaining("rule to watch")]);
    expect(e.foreign).toEqual([]);
  }, 90_000);
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
