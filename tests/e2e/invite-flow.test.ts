import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "../../server/seed/demo";
import { ARTIFACTS, signIn as signInForm, startE2e, type E2e } from "../helpers/browser";

// End to end in Debian's Chromium: the demo admin invites someone, opens the invitation from the Outbox,
// the invitee sets a password and signs in. Screenshots go to tests/artifacts/e2e (git-ignored).

let e: E2e;
beforeAll(async () => {
  e = await startE2e({ demoDesigns: false });
}, 90_000);
afterAll(() => e?.close());

async function newPage(): Promise<Page> {
  const context = await e.browser.newContext({ viewport: { width: 1280, height: 860 } });
  const page = await context.newPage();
  page.on("request", (req) => {
    if (!req.url().startsWith(e.base) && !req.url().startsWith("data:")) e.foreign.push(req.url());
  });
  return page;
}

const signIn = (page: Page, email: string, password: string) => signInForm(page, e.base, email, password);

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
    expect(href.startsWith(`${e.base}/invitation/`)).toBe(true);
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
    expect(e.foreign).toEqual([]);
  }, 60_000);
});
