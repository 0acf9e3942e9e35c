import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch } from "./browser";
import { openScenario } from "./auth";

/**
 * An unstable closed loop reads as unstable wherever a margin is shown: with the valve demo's sense resistor at
 * 10 Ω (loop gain ×10) the loop gain encircles −1 and the linearised step grows (docs/references.md §4.3), so the
 * phase, gain and modulus margin cards all fail — a positive number on one of them is no margin — and the step plot
 * says the small-signal step grows instead of quoting an overshoot. The edit is a what-if, never saved.
 */
describe("an unstable loop in the workbench", () => {
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    browser = await launch();
    page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await openScenario(page, "viewer");
  });

  afterAll(async () => {
    await browser?.close();
  });

  const verdict = (id: string) => page.getByTestId(`metric-${id}`).locator("span.uppercase").textContent();

  it("every margin card fails and the small-signal step grows", async () => {
    const field = page.locator("#field-parts-senseResistor");
    await field.fill("10");
    await field.press("Enter");
    await page.getByTestId("small-signal-legend").filter({ hasText: "grows" }).waitFor({ timeout: 60_000 });
    await expect.poll(() => page.getByTestId("run-status").textContent(), { timeout: 60_000 }).not.toContain("simulating");
    expect(Number.parseFloat((await page.getByTestId("metric-phase-margin-value").textContent())!)).toBeLessThan(0);
    for (const m of ["phase-margin", "gain-margin", "modulus-margin"]) expect((await verdict(m))?.toLowerCase()).toBe("fail");
    expect(await page.getByTestId("metric-gain-margin").textContent()).toContain("unstable");
    expect(await page.getByTestId("metric-overshoot").textContent()).toContain("grows");
  });
});
