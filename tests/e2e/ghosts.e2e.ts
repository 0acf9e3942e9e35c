import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { dragAcross, launch, watchErrors } from "./browser";
import { openScenario } from "./auth";

/**
 * Ghost traces stay inside the plot area. The previous run is drawn behind the current one, dashed at about 35 %
 * opacity (design language); after an edit that moves the response a long way (the sense resistor ten times larger
 * or smaller: the load current, the command drawn as current and the loop gain move with it) and then a dragged zoom
 * box and a Shift-drag pan, the ghost runs far outside the axes' ranges. Whatever is outside the plot area (uPlot's
 * bbox: the axis gutters) must stay free of it, at a desktop, a tablet and a phone width (the phone at 2 device pixels
 * per CSS pixel).
 *
 * The ghost shares its colours with the current traces, so on the canvas alone one cannot tell a ghost pixel in a
 * gutter from the edge of a current trace. The page is therefore instrumented (`markGhostStrokes`, before any script
 * runs): a stroke drawn dashed at about 35 % opacity — the ghost's signature, and no other stroke's — is painted opaque
 * in a colour no plot uses, and the extent of its path is recorded per canvas and frame. The clip, the path and
 * everything else stay the application's own; a ghost drawn in any other way would go uncounted and fail the
 * "the ghost is drawn" assertions.
 */

const MAGENTA = [255, 0, 255] as const;

/** Runs in the page before its own scripts (see above). */
function markGhostStrokes() {
  const proto = CanvasRenderingContext2D.prototype;
  type Frame = { strokes: number; minX: number; maxX: number; minY: number; maxY: number };
  const fresh = (): Frame => ({ strokes: 0, minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity });
  const frameOf = (c: CanvasRenderingContext2D): Frame => {
    const host = c.canvas as HTMLCanvasElement & { quellGhost?: Frame };
    return (host.quellGhost ??= fresh());
  };
  const ghostLike = (c: CanvasRenderingContext2D) => c.getLineDash().length > 0 && Math.abs(c.globalAlpha - 0.35) < 0.1;
  const { clearRect, moveTo, lineTo, stroke } = proto;
  // uPlot clears its whole canvas at the start of each frame
  proto.clearRect = function (x, y, w, h) {
    if (x <= 0 && y <= 0 && w >= this.canvas.width && h >= this.canvas.height) (this.canvas as HTMLCanvasElement & { quellGhost?: Frame }).quellGhost = fresh();
    return clearRect.call(this, x, y, w, h);
  };
  const record = (c: CanvasRenderingContext2D, x: number, y: number) => {
    if (!ghostLike(c) || !Number.isFinite(x) || !Number.isFinite(y)) return;
    const f = frameOf(c);
    f.minX = Math.min(f.minX, x); f.maxX = Math.max(f.maxX, x);
    f.minY = Math.min(f.minY, y); f.maxY = Math.max(f.maxY, y);
  };
  proto.moveTo = function (x, y) { record(this, x, y); return moveTo.call(this, x, y); };
  proto.lineTo = function (x, y) { record(this, x, y); return lineTo.call(this, x, y); };
  const strokeCurrent = stroke as (this: CanvasRenderingContext2D) => void;
  const paint = (c: CanvasRenderingContext2D, path?: Path2D) => (path ? stroke.call(c, path) : strokeCurrent.call(c));
  proto.stroke = function (this: CanvasRenderingContext2D, path?: Path2D) {
    if (!ghostLike(this)) return paint(this, path);
    frameOf(this).strokes += 1;
    this.save();
    this.globalAlpha = 1;
    this.strokeStyle = "#ff00ff";
    paint(this, path);
    this.restore();
  };
}

interface GhostReading {
  /** the ghost's strokes in the last frame */
  strokes: number;
  /** how far the ghost's path reaches beyond the plot area on its farthest side, device pixels (≤ 0: all inside) */
  reach: number;
  /** ghost pixels inside the plot area, and outside it (beyond one device pixel of its edge) */
  inside: number;
  outside: number;
  /** a few of the pixels outside, for the failure message */
  where: string[];
}

/** Reads a uPlot chart's last frame: the ghost's extent against the plot area (uPlot's bbox) and its pixels. */
function readGhost(page: Page, testId: string): Promise<GhostReading> {
  return page.evaluate(
    ([id, colour]) => {
      const host = document.querySelector(`[data-testid="${id}"]`);
      const canvas = host?.querySelector("canvas") as (HTMLCanvasElement & { quellGhost?: { strokes: number; minX: number; maxX: number; minY: number; maxY: number } }) | null;
      const over = host?.querySelector(".u-over");
      if (!canvas || !over) throw new Error(`no uPlot chart at ${id}`);
      // uPlot lays .u-over exactly over the plot area; in device pixels that is u.bbox
      const c = canvas.getBoundingClientRect(), o = over.getBoundingClientRect();
      const ratio = canvas.width / c.width;
      const left = (o.left - c.left) * ratio, top = (o.top - c.top) * ratio;
      const right = left + o.width * ratio, bottom = top + o.height * ratio;
      const g = canvas.quellGhost ?? { strokes: 0, minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity };
      const reach = g.strokes === 0 ? -Infinity : Math.max(left - g.minX, g.maxX - right, top - g.minY, g.maxY - bottom);
      const d = canvas.getContext("2d")!.getImageData(0, 0, canvas.width, canvas.height).data;
      let inside = 0, outside = 0;
      const where: string[] = [];
      for (let y = 0; y < canvas.height; y++) {
        for (let x = 0; x < canvas.width; x++) {
          const k = (y * canvas.width + x) * 4;
          if (d[k + 3]! < 64 || Math.hypot(d[k]! - colour[0], d[k + 1]! - colour[1], d[k + 2]! - colour[2]) > 60) continue;
          // the clip's edge may fall on a half pixel: one device pixel of slack
          if (x + 1 >= left && x < right + 1 && y + 1 >= top && y < bottom + 1) inside++;
          else {
            outside++;
            if (where.length < 5) where.push(`(${x}, ${y}) outside [${left}, ${right}] × [${top}, ${bottom}]`);
          }
        }
      }
      return { strokes: g.strokes, reach, inside, outside, where };
    },
    [testId, MAGENTA] as const,
  );
}

/** The step plot, the loop gain's magnitude and phase, and the closed loop's (the tab open by default). */
const PLOTS = ["uplot-step", "uplot-loop-mag", "uplot-loop-phase", "uplot-closed-mag", "uplot-closed-phase"] as const;

/**
 * On each plot: the whole view, a dragged zoom box, a Shift-drag pan, then a double-click back to the whole view; in
 * each the ghost is checked against the plot area. Once zoomed or panned, the ghost must reach well past the plot
 * area (so only the clip keeps it off the gutters).
 */
async function checkEveryPlot(page: Page, stage: string, deviceScale: number) {
  for (const id of PLOTS) {
    const chart = page.getByTestId(id);
    await chart.evaluate((el) => el.scrollIntoView({ block: "center" }));
    const whole = await readGhost(page, id);
    expect(whole.inside, `${stage}, ${id}: the ghost is painted in the plot area`).toBeGreaterThan(0);
    expect(whole.outside, `${stage}, ${id}, whole view: ${whole.where.join("; ")}`).toBe(0);

    const xRange = async () => [await chart.getAttribute("data-x-min"), await chart.getAttribute("data-x-max")].join(" ");
    const full = await xRange();
    const b = (await chart.locator(".u-over").boundingBox())!;
    await dragAcross(page, b, [0.3, 0.3], [0.55, 0.7]);
    await expect.poll(xRange).not.toBe(full);
    const zoomed = await readGhost(page, id);
    expect(zoomed.reach, `${stage}, ${id}: the zoomed ghost reaches beyond the plot area`).toBeGreaterThan(20 * deviceScale);
    expect(zoomed.outside, `${stage}, ${id}, zoomed: ${zoomed.where.join("; ")}`).toBe(0);

    const before = await xRange();
    await dragAcross(page, b, [0.5, 0.5], [0.85, 0.9], true);
    await expect.poll(xRange).not.toBe(before);
    const panned = await readGhost(page, id);
    expect(panned.reach, `${stage}, ${id}: the panned ghost reaches beyond the plot area`).toBeGreaterThan(20 * deviceScale);
    expect(panned.outside, `${stage}, ${id}, panned: ${panned.where.join("; ")}`).toBe(0);

    await page.mouse.dblclick(b.x + b.width * 0.5, b.y + b.height * 0.5);
    await expect.poll(xRange).toBe(full);
  }
}

const VIEWS = [
  { name: "desktop", width: 1440, height: 900, deviceScaleFactor: 1 },
  { name: "tablet", width: 1024, height: 768, deviceScaleFactor: 1 },
  { name: "phone", width: 390, height: 844, deviceScaleFactor: 2 },
] as const;

describe("ghost traces stay inside the plot area", () => {
  let browser: Browser;
  /** each page's console errors (watchErrors fills its list as they come) */
  const errors: string[][] = [];

  beforeAll(async () => {
    browser = await launch();
  });

  afterAll(async () => {
    await browser?.close();
  });

  for (const view of VIEWS) {
    it(`${view.name}, ${view.width} px: after a tenfold sense resistor, then a hundredfold compensation capacitor, no ghost pixel lies outside the plot area, whole, zoomed or panned`, async () => {
      const context = await browser.newContext({ viewport: { width: view.width, height: view.height }, deviceScaleFactor: view.deviceScaleFactor });
      try {
        const page = await context.newPage();
        await page.addInitScript(markGhostStrokes);
        errors.push(watchErrors(page));
        await openScenario(page, "designer");
        const margin = page.getByTestId("metric-phase-margin-value");
        expect(await page.getByTestId("toggle-command-current").isChecked(), "the command is drawn as current").toBe(true);
        for (const id of PLOTS) expect((await readGhost(page, id)).strokes, `${id}: no ghost before a second run`).toBe(0);

        // A second run a long way from the first: the load current, the command as current and the loop gain scale
        // by ten; the ghost (the first run) lands when the second run does.
        const sense = page.locator("#field-parts-senseResistor");
        await sense.fill((await sense.inputValue()) === "10" ? "1" : "10");
        await sense.press("Enter");
        for (const id of PLOTS) await expect.poll(async () => (await readGhost(page, id)).strokes, { timeout: 30_000 }).toBeGreaterThan(0);
        await checkEveryPlot(page, "sense resistor", view.deviceScaleFactor);

        // A third: the compensation capacitor a hundredfold, which moves the loop's crossover and how far its phase
        // falls (past −360° unwrapped, or not); the ghost is now the second run.
        const settled = () => expect.poll(async () => (await page.getByTestId("run-status").textContent()) ?? "", { timeout: 30_000 }).not.toContain("simulating");
        await settled();
        const pm = (await margin.textContent())?.trim();
        const comp = page.locator("#field-parts-compCapacitor");
        await comp.fill((await comp.inputValue()) === "4.7n" ? "47p" : "4.7n");
        await comp.press("Enter");
        await expect.poll(async () => (await margin.textContent())?.trim(), { timeout: 30_000 }).not.toBe(pm);
        await settled();
        await checkEveryPlot(page, "compensation capacitor", view.deviceScaleFactor);
      } finally {
        await context.close();
      }
    });
  }

  it("ran without page errors", () => {
    expect(errors.flat().filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
  });
});
