import { describe, expect, it } from "vitest";
import { openScenario } from "./auth";
import { suitePage } from "./suite";

/**
 * An unstable closed loop reads as unstable wherever a margin is shown: with the valve demo's sense resistor at
 * 10 Ω (loop gain ×10) the loop gain encircles −1 and the linearised step grows (docs/references.md §4.3), so the
 * phase, gain and modulus margin cards all fail — a positive number on one of them is no margin — and the step plot
 * says the small-signal step grows instead of quoting an overshoot. The edit is a what-if, never saved.
 */
describe("an unstable loop in the workbench", () => {
  const ui = suitePage((page) => openScenario(page, "viewer"));

  const verdict = (id: string) => ui.page.getByTestId(`metric-${id}`).locator("span.uppercase").textContent();

  it("every margin card fails and the small-signal step grows", async () => {
    const field = ui.page.locator("#field-parts-senseResistor");
    await field.fill("10");
    await field.press("Enter");
    await ui.page.getByTestId("small-signal-legend").filter({ hasText: "grows" }).waitFor({ timeout: 60_000 });
    await expect.poll(() => ui.page.getByTestId("run-status").textContent(), { timeout: 60_000 }).not.toContain("simulating");
    expect(Number.parseFloat((await ui.page.getByTestId("metric-phase-margin-value").textContent())!)).toBeLessThan(0);
    for (const m of ["phase-margin", "gain-margin", "modulus-margin"]) expect((await verdict(m))?.toLowerCase()).toBe("fail");
    expect(await ui.page.getByTestId("metric-gain-margin").textContent()).toContain("unstable");
    expect(await ui.page.getByTestId("metric-overshoot").textContent()).toContain("grows");
  });
});
