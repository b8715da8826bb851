import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run } from "../../server/entities";
import { ARTIFACTS, person, signIn, startE2e, type E2e } from "../helpers/browser";

// The built client under the real Content-Security-Policy header (server/middlewares/security-headers.ts), in
// Chromium: every main screen is visited, charts are drawn and hovered (tooltips), and no `securitypolicyviolation`
// event or "Refused to …" console message may appear. The listener is an init script, which CSP does not govern.

let e: E2e;
const pageErrors: string[] = [];
beforeAll(async () => {
  e = await startE2e();
}, 90_000);
afterAll(() => e?.close());

interface Violation {
  directive: string;
  blocked: string;
  sample: string;
  source: string;
  page: string;
}

const LISTENER = `document.addEventListener("securitypolicyviolation", (ev) => {
  window.__lotwiseCsp?.({ directive: ev.violatedDirective, blocked: ev.blockedURI, sample: ev.sample,
    source: ev.sourceFile + ":" + ev.lineNumber, page: location.pathname });
}, true);`;

/** A fresh context whose every page reports CSP violations (and refusals logged to the console) into `violations`. */
async function watchedPage(violations: Violation[]): Promise<{ context: BrowserContext; page: Page }> {
  const context = await e.browser.newContext({ viewport: { width: 1360, height: 900 } });
  await context.exposeFunction("__lotwiseCsp", (v: Violation) => void violations.push(v));
  await context.addInitScript(LISTENER);
  const page = await context.newPage();
  page.on("console", (msg) => {
    if (/Content Security Policy|Refused to/i.test(msg.text())) violations.push({ directive: "console", blocked: "", sample: msg.text(), source: "", page: page.url() });
  });
  page.on("pageerror", (err) => pageErrors.push(err.message));
  page.on("request", (req) => {
    if (!req.url().startsWith(e.base) && !req.url().startsWith("data:")) e.foreign.push(req.url());
  });
  return { context, page };
}

/** Waits for `n` chart canvases, then moves the mouse across the first one so its tooltip is rendered. */
async function drawAndHover(page: Page, n = 1): Promise<void> {
  await page.waitForFunction((count) => document.querySelectorAll("canvas").length >= count, n, { timeout: 20_000 });
  await page.waitForTimeout(300);
  const canvas = page.locator("canvas").first();
  await canvas.scrollIntoViewIfNeeded();
  const box = (await canvas.boundingBox())!;
  for (const fx of [0.3, 0.5, 0.7]) await page.mouse.move(box.x + box.width * fx, box.y + box.height * 0.5, { steps: 4 });
  await page.waitForTimeout(300);
}

describe("content security policy in Chromium", () => {
  it("is satisfied by the sign-in screen, overview, designs, a design workspace, runs and a run dashboard", async () => {
    const violations: Violation[] = [];
    const { context, page } = await watchedPage(violations);
    const main = await page.goto(`${e.base}/sign-in`);
    const csp = main!.headers()["content-security-policy"];
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain("unsafe-eval");
    // The built index.html: every script is an external file, no inline handlers or <style> elements.
    const html = await main!.text();
    const scripts = html.match(/<script\b[^>]*>[\s\S]*?<\/script>/g) ?? [];
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag).toMatch(/^<script\b[^>]*\bsrc="\/assets\/[^"]+\.js"[^>]*><\/script>$/);
    expect(html).not.toMatch(/<style\b|\son[a-z]+\s*=|javascript:/i);
    await page.getByLabel("E-mail").waitFor();
    await page.goto(`${e.base}/forgot-password`);
    await page.getByRole("button").first().waitFor();

    await signIn(page, e.base, person("analyst").email); // a POST with Origin under Referrer-Policy same-origin
    await page.getByRole("link", { name: "Designs" }).click();
    await page.getByRole("heading", { name: "Designs", exact: true }).waitFor();

    const design = e.demo.designs[0];
    await page.goto(`${e.base}/designs/${design.designId}`);
    await drawAndHover(page);
    await page.screenshot({ path: `${ARTIFACTS}/csp-design.png` });
    await page.goto(`${e.base}/designs/${design.designId}/limits`);
    await page.waitForTimeout(500);
    await page.goto(`${e.base}/grades`);
    await page.waitForTimeout(300);

    // A small finished run for the dashboard, launched through the API as the signed-in analyst.
    const launched = await page.request.post(`${e.base}/api/runs`, {
      headers: { Origin: e.base },
      data: { revisionId: design.revisionId, limitSetId: design.limitSetIds[0], trials: 400, seed: 5 },
    });
    expect(launched.status()).toBe(201);
    const runId = ((await launched.json()) as { run: { id: string } }).run.id;
    await e.t.ctx.runQueue.idle();
    expect((await e.t.ctx.dataSource.getRepository(Run).findOneByOrFail({ id: runId })).state).toBe("done");

    await page.goto(`${e.base}/runs`);
    await page.getByRole("heading", { name: "Runs", exact: true }).waitFor();
    await page.goto(`${e.base}/runs/${runId}`);
    await page.getByTestId("yield-value").waitFor({ timeout: 20_000 });
    await drawAndHover(page, 3);
    await page.screenshot({ path: `${ARTIFACTS}/csp-run.png`, fullPage: true });
    await page.goto(`${e.base}/runs/${runId}/trials/0`);
    await drawAndHover(page);
    await page.goto(`${e.base}/runs/${runId}/report`);
    await page.getByText("Lotwise run report").waitFor();
    await drawAndHover(page);
    await page.goto(`${e.base}/`);
    await page.waitForTimeout(500);
    await context.close();

    const admin = await watchedPage(violations);
    await signIn(admin.page, e.base, person("admin").email);
    await admin.page.goto(`${e.base}/team`);
    await admin.page.waitForTimeout(500);
    await admin.page.goto(`${e.base}/outbox`);
    await admin.page.waitForTimeout(500);
    await admin.context.close();

    expect(violations).toEqual([]);
    expect(pageErrors).toEqual([]);
    expect(e.foreign).toEqual([]);
  }, 120_000);

  it("reports an injected inline script and <style> element (the listener can fail the test)", async () => {
    const violations: Violation[] = [];
    const { context, page } = await watchedPage(violations);
    await page.goto(`${e.base}/sign-in`);
    await page.getByLabel("E-mail").waitFor();
    const ran = await page.evaluate(() => {
      const w = window as unknown as { __injected?: boolean };
      const script = document.createElement("script");
      script.textContent = "window.__injected = true";
      document.body.append(script);
      const style = document.createElement("style");
      style.textContent = "body { outline: 1px solid red }";
      document.head.append(style);
      return w.__injected === true;
    });
    await page.waitForTimeout(300);
    await context.close();
    expect(ran).toBe(false);
    const directives = violations.filter((v) => v.blocked === "inline").map((v) => v.directive);
    expect(directives).toContain("script-src-elem");
    expect(directives).toContain("style-src-elem");
  }, 30_000);
});
