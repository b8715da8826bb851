import { existsSync, mkdirSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { chromium, type Browser, type Page } from "playwright-core";
import { User } from "../../server/entities";
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { seedDemoDesigns, type DemoDesignsSummary } from "../../server/seed/demo-designs";
import { createTestContext, type TestContext } from "../helpers/test-context";

// Shared set-up of the analyst and reviewer browser tests: a private database with the demo people, designs,
// limit sets and grade catalogue; the real app on a loopback port; Debian's Chromium.

export const ARTIFACTS = "tests/artifacts/e2e";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
  "--disable-background-networking", "--disable-component-update", "--disable-sync"];

export type E2e = { t: TestContext; base: string; browser: Browser; demo: DemoDesignsSummary; foreign: string[]; close(): Promise<void> };

export async function startE2e(): Promise<E2e> {
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
  page.on("console", (msg) => {
    if (msg.type() === "error") console.error(`[browser console] ${msg.text()}`);
  });
  await page.goto(`${e.base}/sign-in`);
  await page.getByLabel("E-mail").fill(person(role).email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.getByRole("button", { name: "Sign out" }).waitFor();
  return page;
}
