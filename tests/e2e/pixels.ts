import type { Page } from "playwright-core";

/** An sRGB colour as three 0–255 channels. */
export type Rgb = readonly [number, number, number];

export function hexToRgb(hex: string): Rgb {
  return [parseInt(hex.slice(1, 3), 16), parseInt(hex.slice(3, 5), 16), parseInt(hex.slice(5, 7), 16)];
}

/** Euclidean distance between two colours in 0–255 sRGB (0 = the same colour; black to white is 441.7). */
export function rgbDistance(a: Rgb, b: Rgb): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/** A pixel as getImageData returns it: red, green, blue (not premultiplied) and alpha, 0–255. */
export type Rgba = readonly [number, number, number, number];

/**
 * The pixels painted on a canvas at the given points, in CSS pixels from the canvas's top-left corner (each is read
 * from the backing store at the canvas's own pixel ratio).
 */
export function canvasPixels(page: Page, selector: string, points: readonly (readonly [number, number])[]): Promise<Rgba[]> {
  return page.evaluate(
    ([sel, pts]) => {
      const canvas = document.querySelector<HTMLCanvasElement>(sel);
      if (!canvas) throw new Error(`no canvas at ${sel}`);
      const ratio = canvas.width / canvas.getBoundingClientRect().width;
      const ctx = canvas.getContext("2d")!;
      return pts.map(([x, y]) => {
        const d = ctx.getImageData(Math.floor(x * ratio), Math.floor(y * ratio), 1, 1).data;
        return [d[0]!, d[1]!, d[2]!, d[3]!] as [number, number, number, number];
      });
    },
    [selector, points] as const,
  );
}

/** What a census of a canvas's opaque, coloured pixels found (see `paintedColours`). */
export interface ColourCensus {
  /** per palette colour, the opaque pixels within the tolerance of it */
  near: number[];
  /** opaque pixels that are coloured (not a grey: channels more than 40 apart) */
  coloured: number;
  /** of those, the pixels that are a mix of two of the colours (where one stroke crosses or runs along another) */
  blends: number;
  /** of those, the pixels that are neither a palette colour nor a mix of two */
  offPalette: number;
}

/**
 * Counts the fully opaque pixels a canvas shows inside `box` (CSS pixels from the canvas's corner: left, top, width,
 * height), by the palette colour each lies within `tolerance` of, else as a mix of two of the palette and `inks` (the
 * colours other strokes are drawn in) when it lies that near the line between them in sRGB. Greys (axes, grid, ink
 * marks) are left out.
 */
export function paintedColours(page: Page, selector: string, box: readonly [number, number, number, number], palette: readonly Rgb[], tolerance: number, inks: readonly Rgb[] = []): Promise<ColourCensus> {
  return page.evaluate(
    ([sel, b, pal, tol, ink]) => {
      const canvas = document.querySelector<HTMLCanvasElement>(sel);
      if (!canvas) throw new Error(`no canvas at ${sel}`);
      const ratio = canvas.width / canvas.getBoundingClientRect().width;
      const x0 = Math.ceil(b[0] * ratio), y0 = Math.ceil(b[1] * ratio);
      const w = Math.floor(b[2] * ratio), h = Math.floor(b[3] * ratio);
      const d = canvas.getContext("2d")!.getImageData(x0, y0, w, h).data;
      const all = [...pal, ...ink];
      const toSegment = (r: number, g: number, bl: number, a: readonly number[], c: readonly number[]) => {
        const ab = [c[0]! - a[0]!, c[1]! - a[1]!, c[2]! - a[2]!], ap = [r - a[0]!, g - a[1]!, bl - a[2]!];
        const f = Math.max(0, Math.min(1, (ab[0]! * ap[0]! + ab[1]! * ap[1]! + ab[2]! * ap[2]!) / (ab[0]! ** 2 + ab[1]! ** 2 + ab[2]! ** 2 || 1)));
        return Math.hypot(ap[0]! - f * ab[0]!, ap[1]! - f * ab[1]!, ap[2]! - f * ab[2]!);
      };
      const near = pal.map(() => 0);
      let coloured = 0, blends = 0, offPalette = 0;
      for (let k = 0; k < d.length; k += 4) {
        if (d[k + 3]! < 250) continue;
        const r = d[k]!, g = d[k + 1]!, bl = d[k + 2]!;
        if (Math.max(r, g, bl) - Math.min(r, g, bl) <= 40) continue;
        coloured++;
        let best = -1, bestD = Infinity;
        pal.forEach((c, i) => {
          const dist = Math.hypot(r - c[0], g - c[1], bl - c[2]);
          if (dist < bestD) { bestD = dist; best = i; }
        });
        if (bestD <= tol) { near[best]!++; continue; }
        let mixed = false;
        for (let i = 0; i < all.length && !mixed; i++) for (let j = i + 1; j < all.length && !mixed; j++) mixed = toSegment(r, g, bl, all[i]!, all[j]!) <= tol;
        if (mixed) blends++;
        else offPalette++;
      }
      return { near, coloured, blends, offPalette };
    },
    [selector, box, palette, tolerance, inks] as const,
  );
}

/**
 * A uPlot chart's plot area (uPlot's bbox) in CSS pixels from its canvas's corner: left, top, width, height. uPlot
 * lays its `.u-over` element exactly over the plot area, so its place relative to the canvas is the bbox.
 */
export function plotArea(page: Page, testId: string): Promise<[number, number, number, number]> {
  return page.evaluate((id) => {
    const host = document.querySelector(`[data-testid="${id}"]`);
    const canvas = host?.querySelector("canvas"), over = host?.querySelector(".u-over");
    if (!canvas || !over) throw new Error(`no uPlot chart at ${id}`);
    const c = canvas.getBoundingClientRect(), o = over.getBoundingClientRect();
    return [o.left - c.left, o.top - c.top, o.width, o.height] as [number, number, number, number];
  }, testId);
}
