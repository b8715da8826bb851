import { existsSync, mkdirSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { createTestContext, type TestContext } from "../helpers/test-context";

// End to end in Debian's Chromium: the demo admin invites someone, opens the invitation from the Outbox,
// the invitee sets a password and signs in. Screenshots go to tests/artifacts/e2e (git-ignored).

const ARTIFACTS = "tests/artifacts/e2e";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
  "--disable-background-networking", "--disable-component-update", "--disable-sync"];

let t: TestContext;
let server: Server;
let browser: Browser;
let base: string;
const foreignRequests: string[] = [];

beforeAll(async () => {
  if (!existsSync("dist/client/index.html")) throw new Error("The client is not built: run through `npm test` (it runs vite build first).");
  mkdirSync(ARTIFACTS, { recursive: true });
  t = await createTestContext();
  await seedDemo(t.ctx.dataSource);
  server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(0, "127.0.0.1", () => resolve(s));
  });
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  t.ctx.config.publicOrigin = base;
  browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: CHROMIUM_ARGS });
});

afterAll(async () => {
  await browser?.close();
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  server?.closeAllConnections();
  await t?.close();
});

async function newPage(): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  const page = await context.newPage();
  page.on("request", (req) => {
    if (!req.url().startsWith(base) && !req.url().startsWith("data:")) foreignRequests.push(req.url());
  });
  return page;
}

async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${base}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.getByRole("button", { name: "Sign out" }).waitFor();
}

describe("invitation in the browser", () => {
  it("admin invites, invitee accepts from the Outbox link and signs in", async () => {
    const admin = DEMO_PEOPLE.find((p) => p.roles.includes("admin"))!;
    const page = await newPage();
    await signIn(page, admin.email, DEMO_PASSWORD);
    await page.screenshot({ path: `${ARTIFACTS}/1-overview.png` });
    expect(await page.evaluate(() => document.fonts.check('16px "JetBrains Mono"'))).toBe(true);

    await page.getByRole("link", { name: "Team" }).click();
    await page.getByLabel("E-mail").fill("nadia.brook@brackwater.example");
    await page.getByRole("checkbox", { name: "planner" }).check();
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.getByText("nadia.brook@brackwater.example").first().waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/2-team.png` });

    await page.getByRole("link", { name: "Outbox" }).click();
    await page.getByText("You are invited to Lotwise").first().click();
    const link = page.locator('a[href*="/invitation/"]').first();
    await link.waitFor();
    const href = (await link.getAttribute("href"))!;
    expect(href.startsWith(`${base}/invitation/`)).toBe(true);
    await page.screenshot({ path: `${ARTIFACTS}/3-outbox.png` });
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("button", { name: "Sign in" }).waitFor();

    await page.goto(href);
    await page.getByText("nadia.brook@brackwater.example").first().waitFor();
    await page.getByLabel("Your name").fill("Nadia Brook");
    await page.getByLabel("Password", { exact: true }).fill("tidal-bench-passphrase");
    await page.getByLabel("Repeat password").fill("tidal-bench-passphrase");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.getByRole("button", { name: "Sign out" }).waitFor();
    await expect.poll(() => page.getByText("Nadia Brook").count()).toBeGreaterThan(0);
    await page.screenshot({ path: `${ARTIFACTS}/4-invitee-signed-in.png` });
    await page.getByRole("button", { name: "Sign out" }).click();

    await signIn(page, "nadia.brook@brackwater.example", "tidal-bench-passphrase");
    expect(await page.getByRole("link", { name: "Team" }).count()).toBe(0); // a planner sees no admin screens
    await page.screenshot({ path: `${ARTIFACTS}/5-invitee-again.png` });
    expect(foreignRequests).toEqual([]);
  }, 60_000);
});
