import { describe, expect, it } from "vitest";
import type { Download } from "playwright-core";
import { openScenario } from "./auth";
import { canvasPixels, hexToRgb, paintedColours, plotArea, rgbDistance, type Rgb } from "./pixels";
import { suitePage } from "./suite";

/**
 * Plots painted in Quell's own colours, read back from the pixels the browser shows: the map's cells and its colour bar
 * lie on Quell's sequential scale, with the lowest and highest cells at its two ends; the step plot's traces are
 * Okabe–Ito colours. The colours are written out here from the design language (../shared/DESIGN-LANGUAGE.md,
 * "Colour") rather than imported from components/plots/palette.ts, so a palette that drifts from it fails here.
 */

/** Maps: paper → light teal → teal → signal teal → deep teal, linear in sRGB between equally spaced stops. */
const MAP_SCALE: readonly Rgb[] = ["#F7F5F0", "#CFE8E4", "#5FB3A8", "#0F766E", "#0B3B3A"].map(hexToRgb);
/** Traces: the Okabe–Ito colour-blind-safe palette (Okabe & Ito, 2008). */
const OKABE_ITO: readonly Rgb[] = ["#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#F0E442", "#000000"].map(hexToRgb);

/** The scale's colour at t ∈ [0, 1]. */
function scaleAt(t: number): Rgb {
  const x = Math.max(0, Math.min(1, t)) * (MAP_SCALE.length - 1);
  const i = Math.min(MAP_SCALE.length - 2, Math.floor(x)), f = x - i;
  const a = MAP_SCALE[i]!, b = MAP_SCALE[i + 1]!;
  return [a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2])];
}

/** How far a colour lies from the scale (the polyline through its stops in sRGB), and where along it (t) it is nearest. */
function nearestOnScale(c: Rgb): { distance: number; t: number } {
  let best = { distance: Infinity, t: 0 };
  for (let i = 0; i < MAP_SCALE.length - 1; i++) {
    const a = MAP_SCALE[i]!, b = MAP_SCALE[i + 1]!;
    const ab = [b[0] - a[0], b[1] - a[1], b[2] - a[2]], ac = [c[0] - a[0], c[1] - a[1], c[2] - a[2]];
    const f = Math.max(0, Math.min(1, (ab[0]! * ac[0]! + ab[1]! * ac[1]! + ab[2]! * ac[2]!) / (ab[0]! ** 2 + ab[1]! ** 2 + ab[2]! ** 2)));
    const p: Rgb = [a[0] + f * ab[0]!, a[1] + f * ab[1]!, a[2] + f * ab[2]!];
    const distance = rgbDistance(c, p);
    if (distance < best.distance) best = { distance, t: (i + f) / (MAP_SCALE.length - 1) };
  }
  return best;
}

/** The step plot's marks (10 %/90 %, peak, ±1 % band): muted ink, design language. */
const MARK_INK = hexToRgb("#5B6472");
/** The plots' faint grid (components/plots/palette.ts), which the traces cross. */
const GRID = hexToRgb("#ECE9E2");

const rgbOf = (p: readonly number[]): Rgb => [p[0]!, p[1]!, p[2]!];

async function readDownload(d: Download): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const c of await d.createReadStream()) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

describe("plots are painted in Quell's palette", () => {
  const ui = suitePage((page) => openScenario(page, "designer"), { acceptDownloads: true });

  it("the step plot's traces, as the legend shows them and as the canvas paints them, are Okabe–Ito colours", async () => {
    const fig = ui.page.getByTestId("plot-step");
    await expect.poll(() => ui.page.getByTestId("toggle-command-current").isChecked()).toBe(true);
    await expect.poll(() => fig.getAttribute("data-series")).toContain("Command as current");
    const names = (await fig.getAttribute("data-series"))!.split("|");
    // the legend's swatch of each trace (row 0 is the time axis)
    const swatches = await fig.locator(".u-legend .u-series").evaluateAll((rows) =>
      rows.slice(1).map((r) => getComputedStyle(r.querySelector(".u-marker")!).borderTopColor));
    expect(swatches).toHaveLength(names.length);
    const colours = swatches.map((s) => rgbOf((s.match(/\d+/g) ?? []).map(Number)));
    for (const [i, c] of colours.entries()) {
      const nearest = Math.min(...OKABE_ITO.map((o) => rgbDistance(c, o)));
      expect(nearest, `${names[i]}: ${swatches[i]}`).toBe(0);
    }
    expect(new Set(swatches).size, "one colour per trace").toBe(swatches.length);

    // what the canvas paints inside the plot area: every trace's colour is there, and no colour off the palette is but
    // where two strokes cross or run together (a trace and the grid, or the grey marks of the 10 %/90 % points and the
    // ±1 % band)
    const census = await paintedColours(ui.page, '[data-testid="uplot-step"] canvas', await plotArea(ui.page, "uplot-step"), OKABE_ITO, 12, [MARK_INK, GRID]);
    for (const [i, c] of colours.entries()) {
      const n = census.near[OKABE_ITO.findIndex((o) => rgbDistance(c, o) === 0)]!;
      expect(n, `pixels painted in ${names[i]}'s colour`).toBeGreaterThanOrEqual(20);
    }
    expect(census.coloured).toBeGreaterThan(500);
    expect(census.offPalette / census.coloured, JSON.stringify(census)).toBeLessThan(0.02);
  });

  it("a 3 × 3 map's cells and colour bar lie on Quell's sequential scale, lowest cell at paper, highest at deep teal", async () => {
    await ui.page.getByTestId("studies-toggle").click();
    await ui.page.getByTestId("studies-tab-map").click();
    const setAxis = async (axis: "x" | "y", path: string, from: string, to: string) => {
      await ui.page.locator(`#studies-map-${axis}-path`).selectOption(path);
      await ui.page.locator(`#studies-map-${axis}-scale`).selectOption("log");
      for (const [field, value] of [["from", from], ["to", to], ["points", "3"]] as const) {
        const f = ui.page.locator(`#field-studies-map-${axis}-${field}`);
        await f.fill(value);
        await f.press("Enter");
        await expect.poll(() => f.getAttribute("aria-invalid")).not.toBe("true");
      }
    };
    // a compensation capacitor from ringing to well damped (docs/references.md §5a: more margin, less overshoot)
    await setAxis("x", "parts.compCapacitor", "100p", "10n");
    await setAxis("y", "parts.baseResistor", "100", "2.2k");
    await ui.page.locator("#map-metric").selectOption("overshootPct");
    await ui.page.getByTestId("map-run").click();
    await ui.page.locator('[data-testid="study-status-map"][data-status="done"]').waitFor({ timeout: 90_000 });

    const [csv] = await Promise.all([ui.page.waitForEvent("download"), ui.page.getByTestId("map-export-csv").click()]);
    const rows = (await readDownload(csv)).trimEnd().split("\r\n").slice(1).map((l) => l.split(",").map(Number));
    expect(rows).toHaveLength(9);
    const values = rows.map((r) => r[2]!);
    expect(values.every(Number.isFinite), `map values ${values.join(", ")}`).toBe(true);
    const lo = Math.min(...values), hi = Math.max(...values);
    expect(hi).toBeGreaterThan(lo);

    const canvas = ui.page.getByTestId("map-canvas");
    const [nx, ny] = (await canvas.getAttribute("data-grid"))!.split(" ").map(Number) as [number, number];
    expect([nx, ny]).toEqual([3, 3]);
    const [left, top, width, height] = (await canvas.getAttribute("data-cells-box"))!.split(" ").map(Number) as [number, number, number, number];
    // row-major as exported: value k is the cell (k mod nx) across, (k div nx) up from the bottom row
    const centres = values.map((_, k) => [left + ((k % nx) + 0.5) * (width / nx), top + (ny - 1 - Math.floor(k / nx) + 0.5) * (height / ny)] as const);
    const cells = (await canvasPixels(ui.page, '[data-testid="map-canvas"]', centres)).map((p) => {
      expect(p[3], "a cell is painted opaque").toBe(255);
      return rgbOf(p);
    });
    cells.forEach((c, k) => {
      const where = `cell ${k} (${values[k]}): rgb(${c.join(",")})`;
      expect(nearestOnScale(c).distance, `${where} lies on the scale`).toBeLessThanOrEqual(2);
      // and at the place its value takes between the map's lowest and highest (rounding to whole channels aside)
      expect(rgbDistance(c, scaleAt((values[k]! - lo) / (hi - lo))), `${where} sits where its value puts it`).toBeLessThanOrEqual(2);
    });
    expect(rgbDistance(cells[values.indexOf(lo)]!, MAP_SCALE[0]!), "the lowest cell is paper").toBeLessThanOrEqual(1);
    expect(rgbDistance(cells[values.indexOf(hi)]!, MAP_SCALE[MAP_SCALE.length - 1]!), "the highest cell is deep teal").toBeLessThanOrEqual(1);

    // the colour bar beside the map: the whole scale, deep teal (highest) at the top down to paper (lowest)
    const [barLeft, barTop, barWidth, barHeight] = (await canvas.getAttribute("data-scale-box"))!.split(" ").map(Number) as [number, number, number, number];
    const samples = 25;
    const bar = (await canvasPixels(ui.page, '[data-testid="map-canvas"]',
      Array.from({ length: samples }, (_, i) => [barLeft + barWidth / 2, barTop + 0.5 + (i / (samples - 1)) * (barHeight - 1)] as const))).map(rgbOf);
    const along = bar.map((c, i) => {
      const n = nearestOnScale(c);
      expect(n.distance, `bar sample ${i}: rgb(${c.join(",")}) lies on the scale`).toBeLessThanOrEqual(3);
      return n.t;
    });
    for (let i = 1; i < samples; i++) expect(along[i]!, `bar sample ${i} is no darker than the one above`).toBeLessThanOrEqual(along[i - 1]! + 0.005);
    expect(rgbDistance(bar[0]!, cells[values.indexOf(hi)]!), "the bar's top is the highest cell's colour").toBeLessThanOrEqual(3);
    expect(rgbDistance(bar[samples - 1]!, cells[values.indexOf(lo)]!), "the bar's foot is the lowest cell's colour").toBeLessThanOrEqual(3);
    // every stop of the scale shows on the bar (the polyline, not a chord that skips the teal)
    for (const stop of MAP_SCALE) expect(Math.min(...bar.map((c) => rgbDistance(c, stop)))).toBeLessThanOrEqual(12);
  });

  it("ran without page errors", () => {
    expect(ui.errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
  });
});
