import { describe, expect, it } from "vitest";
import { BASE_URL, dragAcross, open } from "./browser";
import { openScenario } from "./auth";
import { suitePage } from "./suite";

/**
 * Plots a practitioner can read: zoom with a box, pan, reset; two cursors and their differences; the step plot's
 * marks (10 %/90 %, peak, ±1 % band); the command drawn as current with its own toggle; only a template's own traces.
 */
describe("plots: zoom, pan, cursors, marks and traces", () => {
  const ui = suitePage((page) => openScenario(page, "designer"));

  const xRange = async (testId: string) => {
    const el = ui.page.getByTestId(testId);
    return { min: Number(await el.getAttribute("data-x-min")), max: Number(await el.getAttribute("data-x-max")) };
  };
  const overBox = async (testId: string) => (await ui.page.getByTestId(testId).locator(".u-over").boundingBox())!;

  for (const testId of ["uplot-step", "uplot-loop-mag", "uplot-loop-phase"]) {
    it(`${testId}: a dragged box zooms, Shift-drag pans, a double-click resets`, async () => {
      const full = await xRange(testId);
      expect(full.max).toBeGreaterThan(full.min);
      const b = await overBox(testId);
      await dragAcross(ui.page, b, [0.3, 0.3], [0.5, 0.7]);
      const zoomed = await xRange(testId);
      expect(zoomed.min).toBeGreaterThan(full.min);
      expect(zoomed.max).toBeLessThan(full.max);

      await dragAcross(ui.page, b, [0.5, 0.5], [0.7, 0.5], true);
      const panned = await xRange(testId);
      expect(panned.min).toBeLessThan(zoomed.min);

      await ui.page.mouse.dblclick(b.x + b.width * 0.5, b.y + b.height * 0.5);
      const reset = await xRange(testId);
      expect(reset.min).toBeCloseTo(full.min, 12);
      expect(reset.max).toBeCloseTo(full.max, 12);
    });
  }

  it("two cursors read out their values and differences: Δt and ΔI on the step, Δf with ΔdB and Δphase on the loop gain", async () => {
    for (const [testId, words] of [["uplot-step", ["Δt", "ΔI"]], ["uplot-loop-mag", ["Δf", "ΔdB"]], ["uplot-loop-phase", ["Δf", "Δphase"]]] as const) {
      const b = await overBox(testId);
      await ui.page.mouse.click(b.x + b.width * 0.25, b.y + b.height * 0.5);
      await ui.page.mouse.click(b.x + b.width * 0.6, b.y + b.height * 0.5);
      const delta = ui.page.getByTestId(`${testId}-delta`);
      await delta.waitFor();
      const text = (await delta.textContent()) ?? "";
      for (const w of words) expect(text).toContain(w);
      expect(await ui.page.getByTestId(`${testId}-cursors`).textContent()).toMatch(/A .*B /);
    }
  });

  it("the step plot marks the 10 %/90 % points, the peak and the ±1 % band, and draws the command as current with its own toggle", async () => {
    const fig = ui.page.getByTestId("plot-step");
    expect((await fig.getAttribute("data-marks"))?.split(" ")).toEqual(["10", "90", "peak", "band"]);
    expect(await fig.getAttribute("data-series")).toContain("Command as current");
    await ui.page.getByTestId("toggle-command-current").uncheck();
    await expect.poll(() => fig.getAttribute("data-series")).not.toContain("Command as current");
    await ui.page.getByTestId("toggle-command-current").check();
    await expect.poll(() => fig.getAttribute("data-series")).toContain("Command as current");
  });

  it("the Howland pump's step plot has no collector/drain trace", async () => {
    await open(ui.page, `${BASE_URL}/scenarios/new`);
    await ui.page.getByTestId("template-howland").click();
    await ui.page.getByTestId("new-draft").click();
    await ui.page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    const series = (await ui.page.getByTestId("plot-step").getAttribute("data-series")) ?? "";
    expect(series).toContain("Load current");
    expect(series).not.toContain("Collector/drain");
    expect(await ui.page.getByTestId("plot-step").locator(".u-legend").textContent()).not.toContain("Collector/drain");
  });

  it("ran without page errors", () => {
    expect(ui.errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
  });
});
