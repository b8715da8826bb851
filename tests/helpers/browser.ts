import { existsSync, mkdirSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { User } from "../../server/entities";
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { seedDemoDesigns, type DemoDesignsSummary } from "../../server/seed/demo-designs";
import { createTestContext, type TestContext } from "./test-context";

// Shared set-up of the browser tests: a private database with the demo people, designs, limit sets and grade
// catalogue; the real app on a loopback port; Debian's Chromium through playwright-core (never a downloaded browser).

export const ARTIFACTS = "tests/artifacts/e2e";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
  "--disable-background-networking", "--disable-component-update", "--disable-sync"];

export type E2e = { t: TestContext; base: string; browser: Browser; demo: DemoDesignsSummary; foreign: string[]; close(): Promise<void> };

/** Starts the app on a loopback port over a fresh database with the demo people (and, unless told not to, the demo designs). */
export async function startE2e(options: { demoDesigns?: boolean } = {}): Promise<E2e> {
  // LOTWISE_CLIENT_DIR lets a test run serve a private build while others rebuild dist/client.
  const clientDir = process.env.LOTWISE_CLIENT_DIR ?? "dist/client";
  if (!existsSync(`${clientDir}/index.html`)) throw new Error(`The client is not built in ${clientDir}: run \`npx vite build\` first.`);
  mkdirSync(ARTIFACTS, { recursive: true });
  const t = await createTestContext();
  await seedDemo(t.ctx.dataSource);
  const users = t.ctx.dataSource.getRepository(User);
  const designer = await users.findOneByOrFail({ email: person("designer").email });
  const planner = await users.findOneByOrFail({ email: person("planner").email });
  const demo = options.demoDesigns === false
    ? { designsAdded: 0, gradesAdded: 0, designs: [] }
    : await seedDemoDesigns(t.ctx.dataSource, { designer: designer.id, planner: planner.id });
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
export function person(role: string) {
  return DEMO_PEOPLE.find((p) => p.roles.includes(role as never))!;
}

/** A fresh browser context signed in as the demo person with this role. */
export async function signedInPage(e: E2e, role: string): Promise<Page> {
  const context = await e.browser.newContext({ viewport: { width: 1360, height: 900 } });
  const page = await context.newPage();
  page.on("request", (req) => {
    if (!req.url().startsWith(e.base) && !req.url().startsWith("data:")) e.foreign.push(req.url());
  });
  page.on("response", (res) => {
    if (res.status() >= 500) console.error(`[browser] ${res.status()} ${res.url()}`);
  });
  page.on("pageerror", (err) => console.error(`[browser] ${err.message}`));
  await signIn(page, e.base, person(role).email);
  return page;
}

/** Signs in through the sign-in form and waits for the app frame. */
export async function signIn(page: Page, base: string, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${base}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.getByRole("button", { name: "Sign out" }).waitFor();
}
