import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eSeriesValues } from "../../shared/engine/e-series";
import { DEMO_PEOPLE } from "../../server/seed/demo";
import { ARTIFACTS, signIn as signInForm, startE2e, type E2e } from "../helpers/browser";

// End to end in Debian's Chromium: the demo designer starts a design from a 5th-order Butterworth
// low-pass prototype at 100 MHz, snaps every part to E24 and saves a new revision, which the API then
// returns with E24 values. Screenshots go to tests/artifacts/e2e (git-ignored).

let e: E2e;
beforeAll(async () => {
  e = await startE2e({ demoDesigns: false });
}, 90_000);
afterAll(() => e?.close());

const signIn = (page: Page, email: string) => signInForm(page, e.base, email);

/** True when v is an E24 member times a power of ten (to 1e-9 relative). */
function isE24(v: number): boolean {
  const decade = Math.pow(10, Math.floor(Math.log10(v) + 1e-12));
  return eSeriesValues("E24").some((m) => Math.abs(m * decade - v) <= 1e-9 * v || Math.abs(m * decade * 10 - v) <= 1e-9 * v);
}

describe("designer in the browser", () => {
  it("starts from a Butterworth prototype, snaps all to E24 and saves a revision", async () => {
    const designer = DEMO_PEOPLE.find((p) => p.roles.includes("designer"))!;
    const context = await e.browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    const pageErrors: string[] = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    await signIn(page, designer.email);

    await page.getByRole("link", { name: "Designs" }).click();
    await page.getByText("No designs yet.").waitFor();
    await page.getByRole("link", { name: "New design" }).click();
    await page.getByLabel("Family").selectOption("butterworth");
    await page.getByLabel("Response").selectOption("lowpass");
    await page.getByLabel("Order").fill("5");
    await page.getByLabel("Cutoff (Hz)").fill("100M");
    await page.getByText("5 parts: C1, L2, C3, L4, C5").waitFor();
    await page.getByLabel("Name", { exact: true }).fill("Harmonic low-pass 100 MHz");
    await page.locator("canvas").first().waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/designer-1-new-design.png`, fullPage: true });
    await page.getByRole("button", { name: "Create design" }).click();

    await page.getByRole("heading", { name: "Harmonic low-pass 100 MHz" }).waitFor();
    const value1 = page.getByLabel("Value, row 1");
    await expect.poll(() => value1.inputValue()).toBe("19.67 pF"); // [C] g1 = 0.618 (Butterworth n=5) → C1 = g1/(2π·100 MHz·50 Ω) = 19.67 pF (tests/fixtures/generators/closed_form_values.py)

    // A bad cell is marked and blocks saving; Enter moves down the column.
    await page.getByLabel("Value, row 2").fill("12x");
    await expect.poll(() => page.getByLabel("Value, row 2").getAttribute("aria-invalid")).toBe("true");
    expect(await page.getByRole("button", { name: "Save as new revision" }).isDisabled()).toBe(true);
    await page.screenshot({ path: `${ARTIFACTS}/designer-2-cell-error.png`, fullPage: true });
    await page.getByLabel("Value, row 2").fill("128.8n");
    await value1.focus();
    await page.keyboard.press("Enter");
    expect(await page.evaluate(() => document.activeElement?.getAttribute("aria-label"))).toBe("Value, row 2");

    // Add a row (blank value: an error, saving off), move it up, remove it.
    await page.getByRole("button", { name: "Add C" }).click();
    await expect.poll(() => page.getByLabel("Value, row 6").getAttribute("aria-invalid")).toBe("true");
    expect(await page.getByLabel("Ref, row 6").inputValue()).toBe("C2");
    await page.getByRole("button", { name: "Move row 6 up" }).click();
    expect(await page.getByLabel("Ref, row 5").inputValue()).toBe("C2");
    await page.getByRole("button", { name: "Remove row 5" }).click();
    expect(await page.getByLabel("Ref, row 5").inputValue()).toBe("C5");
    expect(await page.getByRole("button", { name: "Save as new revision" }).isDisabled()).toBe(false);

    await page.getByLabel("Series for snap all").selectOption("E24");
    await page.getByRole("button", { name: "Snap all", exact: true }).click();
    await expect.poll(() => page.getByTestId("snap-1").textContent()).toContain("20 pF"); // E24 neighbours of 19.67: 18, 20 → 20 (+1.7 %)
    await page.getByLabel("Note for this revision").fill("Snapped to E24");
    await page.waitForTimeout(400); // let the debounced plot settle for the screenshot
    await page.screenshot({ path: `${ARTIFACTS}/designer-3-snapped.png`, fullPage: true });
    await page.getByRole("button", { name: "Save as new revision" }).click();
    await page.waitForURL(/revision=/);
    await expect.poll(() => page.getByLabel("Revision").locator("option:checked").textContent()).toContain("r2");
    await page.screenshot({ path: `${ARTIFACTS}/designer-4-saved.png`, fullPage: true });

    // A bad parts file is refused with its line and field; nothing is stored.
    await page.getByLabel("Parts file (.csv or .json)").setInputFiles({
      name: "parts.csv", mimeType: "text/csv", buffer: Buffer.from("ref,kind,node1,node2,value\nC1,C,n1,gnd,abc\n"),
    });
    await page.getByRole("button", { name: "Upload" }).first().click();
    await page.getByRole("alert").filter({ hasText: "line 2" }).waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/designer-5-bad-upload.png`, fullPage: true });

    // Stored through the API: r2 with every part on E24.
    const { designs } = await (await page.request.get(`${e.base}/api/designs`)).json();
    const design = designs.find((d: { name: string }) => d.name === "Harmonic low-pass 100 MHz");
    expect(design.latestRevision.number).toBe(2);
    const { revision } = await (await page.request.get(`${e.base}/api/revisions/${design.latestRevision.id}`)).json();
    expect(revision.note).toBe("Snapped to E24");
    expect(revision.netlist.parts).toHaveLength(5);
    for (const part of revision.netlist.parts) {
      expect(part.series).toBe("E24");
      expect(isE24(part.value), `${part.ref} = ${part.value}`).toBe(true);
    }
    expect(pageErrors).toEqual([]);
    await context.close();
  }, 90_000);
});
