/**
 * Where the schematic's texts collide, measured in the rendered SVG (run inside the page with `page.evaluate`).
 *
 * Every `<text>` is a box: its `getBBox()` (the font's full ascent-to-descent box, not the ink) taken through the
 * element's transform into the root SVG's viewBox units (getScreenCTM of the element, then the inverse of the root's).
 * Every drawn shape is geometry in the same units: lines, polylines and polygon/rect edges as segments, circles and
 * ellipses as 64-sided polygons, paths sampled every 0.5 unit along their length; a segment is as wide as its
 * computed stroke, and a filled shape (a resistor's body, the op-amp's triangle, a junction dot) is solid inside.
 * The transparent selection highlight of each part is not drawn and is left out.
 *
 * A text must not overlap another text, a wire or a symbol, and must lie inside the viewBox. A symbol's own marks
 * (the op-amp's + and −, its V+ and V− pins, a source's +; `data-symbol` on their group) are texts too, checked
 * against everything but the symbol they belong to.
 *
 * Tolerance: {@link OVERLAP_TOLERANCE}, in viewBox units (one unit is one CSS pixel when the schematic is drawn
 * 590 px wide). It forgives sub-pixel differences in font metrics and anti-aliasing between machines, never a stroke
 * through a label: a stroke is at least 1.2 units wide.
 *
 * The function is self-contained (no imports, no helpers outside its body) because Playwright sends its source text
 * to the page.
 */

/** How far a text's box may run into another box or a stroke before it counts as an overlap, viewBox units. */
export const OVERLAP_TOLERANCE = 0.5;

/** Arguments of {@link schematicOverlaps}: the root SVG's selector and the tolerance. */
export interface OverlapQuery {
  selector: string;
  tolerance: number;
}

/** Runs in the page: one line per collision, naming the texts (and the shape) involved; empty when none collide. */
export function schematicOverlaps({ selector, tolerance }: OverlapQuery): string[] {
  type Pt = { x: number; y: number };
  type Box = { x0: number; y0: number; x1: number; y1: number };
  type Shape = { what: string; owner: Element; segs: [Pt, Pt][]; halfWidth: number; area: Pt[] | null };

  const svg = document.querySelector(selector) as SVGSVGElement | null;
  if (!svg) return [`no SVG matches ${selector}`];
  const rootInv = (svg.getScreenCTM() as DOMMatrix).inverse();
  const toRoot = (el: SVGGraphicsElement) => rootInv.multiply(el.getScreenCTM() as DOMMatrix);
  const apply = (m: DOMMatrix, x: number, y: number): Pt => {
    const p = new DOMPoint(x, y).matrixTransform(m);
    return { x: p.x, y: p.y };
  };
  const r1 = (v: number) => Math.round(v * 10) / 10;
  const fmt = (p: Pt) => `(${r1(p.x)}, ${r1(p.y)})`;
  const visible = (c: string) => c !== "none" && c !== "transparent" && !/^rgba\(.*,\s*0\)$/.test(c);

  const partOf = (el: Element) => el.closest("[data-part]")?.getAttribute("data-part");
  const symbolOf = (el: Element) => el.closest("[data-symbol]")?.getAttribute("data-symbol");
  /** A text in words: its content and the part it belongs to (a symbol's mark or an operating-point tag says so). */
  const textName = (el: Element) => {
    const part = partOf(el), symbol = symbolOf(el);
    const tag = el.closest('[data-testid="op-tag"]') ? " (operating-point tag)" : "";
    return `"${(el.textContent ?? "").trim()}"${symbol ? ` (${symbol} mark)` : ""}${tag}${part ? ` of ${part}` : ""}`;
  };
  /** A shape in words: the symbol it is drawn in (and its element), or a wire; and the part it belongs to. */
  const shapeName = (el: Element) => {
    const part = partOf(el), symbol = symbolOf(el);
    const what = symbol === "wire" ? "wire" : symbol ? `${symbol} (${el.tagName.toLowerCase()})` : el.tagName.toLowerCase();
    return `${what}${part ? ` of ${part}` : ""}`;
  };

  // --- texts ---
  const texts: { name: string; el: SVGTextElement; box: Box; symbol: Element | null }[] = [];
  for (const el of svg.querySelectorAll("text")) {
    const t = el as SVGTextElement;
    const b = t.getBBox();
    if (b.width === 0 || b.height === 0) continue;
    const m = toRoot(t);
    const c = [apply(m, b.x, b.y), apply(m, b.x + b.width, b.y), apply(m, b.x, b.y + b.height), apply(m, b.x + b.width, b.y + b.height)];
    texts.push({
      name: textName(t),
      el: t,
      box: { x0: Math.min(...c.map((p) => p.x)), y0: Math.min(...c.map((p) => p.y)), x1: Math.max(...c.map((p) => p.x)), y1: Math.max(...c.map((p) => p.y)) },
      symbol: t.closest("[data-symbol]"),
    });
  }

  // --- shapes ---
  const shapes: Shape[] = [];
  const ring = (pts: Pt[]): [Pt, Pt][] => pts.map((p, i) => [p, pts[(i + 1) % pts.length]] as [Pt, Pt]);
  const chain = (pts: Pt[]): [Pt, Pt][] => pts.slice(1).map((p, i) => [pts[i], p] as [Pt, Pt]);
  for (const el of svg.querySelectorAll("line, polyline, polygon, rect, circle, ellipse, path")) {
    const g = el as SVGGeometryElement;
    if (el.matches("rect.hl")) continue;
    const style = getComputedStyle(el);
    if (style.display === "none" || style.visibility === "hidden") continue;
    const stroked = visible(style.stroke) && Number.parseFloat(style.strokeWidth) > 0;
    const filled = visible(style.fill) && Number.parseFloat(style.fillOpacity || "1") > 0;
    if (!stroked && !filled) continue;
    const m = toRoot(g);
    let outline: Pt[] = [];
    let closed = true;
    const tag = el.tagName.toLowerCase();
    if (tag === "line") {
      const l = el as SVGLineElement;
      outline = [apply(m, l.x1.baseVal.value, l.y1.baseVal.value), apply(m, l.x2.baseVal.value, l.y2.baseVal.value)];
      closed = false;
    } else if (tag === "polyline" || tag === "polygon") {
      outline = [...(el as SVGPolylineElement).points].map((p) => apply(m, p.x, p.y));
      closed = tag === "polygon";
    } else if (tag === "rect") {
      const r = el as SVGRectElement;
      const [x, y, w, h] = [r.x.baseVal.value, r.y.baseVal.value, r.width.baseVal.value, r.height.baseVal.value];
      outline = [apply(m, x, y), apply(m, x + w, y), apply(m, x + w, y + h), apply(m, x, y + h)];
    } else if (tag === "circle" || tag === "ellipse") {
      const c = el as SVGEllipseElement & SVGCircleElement;
      const cx = c.cx.baseVal.value, cy = c.cy.baseVal.value;
      const rx = tag === "circle" ? c.r.baseVal.value : c.rx.baseVal.value;
      const ry = tag === "circle" ? c.r.baseVal.value : c.ry.baseVal.value;
      for (let i = 0; i < 64; i++) outline.push(apply(m, cx + rx * Math.cos((i / 64) * 2 * Math.PI), cy + ry * Math.sin((i / 64) * 2 * Math.PI)));
    } else {
      // a path: sampled along its length; a jump between samples is a move to a new subpath, not a stroke
      const p = el as SVGPathElement;
      const len = p.getTotalLength();
      const step = 0.5;
      let run: Pt[] = [];
      let last: DOMPoint | null = null;
      for (let s = 0; s <= len + step / 2; s += step) {
        const q = p.getPointAtLength(Math.min(s, len));
        if (last && Math.hypot(q.x - last.x, q.y - last.y) > 2 * step) {
          if (stroked && run.length > 1) shapes.push({ what: shapeName(el), owner: el, segs: chain(run), halfWidth: Number.parseFloat(style.strokeWidth) / 2, area: null });
          run = [];
        }
        run.push(apply(m, q.x, q.y));
        last = q;
      }
      if (stroked && run.length > 1) shapes.push({ what: shapeName(el), owner: el, segs: chain(run), halfWidth: Number.parseFloat(style.strokeWidth) / 2, area: null });
      continue;
    }
    shapes.push({
      what: shapeName(el),
      owner: el,
      segs: stroked ? (closed ? ring(outline) : chain(outline)) : [],
      halfWidth: stroked ? Number.parseFloat(style.strokeWidth) / 2 : 0,
      area: filled && closed && outline.length > 2 ? outline : null,
    });
  }

  // --- geometry ---
  const shrink = (b: Box, d: number): Box => ({ x0: b.x0 + d, y0: b.y0 + d, x1: b.x1 - d, y1: b.y1 - d });
  const inside = (p: Pt, b: Box) => p.x >= b.x0 && p.x <= b.x1 && p.y >= b.y0 && p.y <= b.y1;
  const cross = (a: Pt, b: Pt, c: Pt) => (b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x);
  const segsCross = (p: Pt, q: Pt, r: Pt, s: Pt) => cross(p, q, r) * cross(p, q, s) < 0 && cross(r, s, p) * cross(r, s, q) < 0;
  const pointSeg = (p: Pt, a: Pt, b: Pt) => {
    const dx = b.x - a.x, dy = b.y - a.y;
    const l2 = dx * dx + dy * dy;
    const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / l2));
    return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
  };
  const pointBox = (p: Pt, b: Box) => Math.hypot(Math.max(b.x0 - p.x, 0, p.x - b.x1), Math.max(b.y0 - p.y, 0, p.y - b.y1));
  const corners = (b: Box): Pt[] => [{ x: b.x0, y: b.y0 }, { x: b.x1, y: b.y0 }, { x: b.x1, y: b.y1 }, { x: b.x0, y: b.y1 }];
  /** Distance from a segment to a box (0 when it enters it). */
  const segBox = (a: Pt, b: Pt, box: Box) => {
    if (inside(a, box) || inside(b, box)) return 0;
    const c = corners(box);
    for (let i = 0; i < 4; i++) if (segsCross(a, b, c[i], c[(i + 1) % 4])) return 0;
    return Math.min(pointBox(a, box), pointBox(b, box), ...c.map((p) => pointSeg(p, a, b)));
  };
  const inPolygon = (p: Pt, poly: Pt[]) => {
    let odd = false;
    for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
      const a = poly[i], b = poly[j];
      if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) odd = !odd;
    }
    return odd;
  };
  /** A box and a filled polygon share area: a corner of one inside the other, or their edges cross. */
  const boxArea = (box: Box, poly: Pt[]) =>
    corners(box).some((p) => inPolygon(p, poly)) ||
    poly.some((p) => inside(p, box)) ||
    ring(poly).some(([a, b]) => segBox(a, b, box) === 0);

  // --- the checks ---
  const found: string[] = [];
  const view = svg.viewBox.baseVal;
  for (const t of texts) {
    const b = shrink(t.box, tolerance);
    if (b.x0 < view.x || b.y0 < view.y || b.x1 > view.x + view.width || b.y1 > view.y + view.height) {
      found.push(`${t.name} runs outside the drawing: box ${fmt({ x: t.box.x0, y: t.box.y0 })}–${fmt({ x: t.box.x1, y: t.box.y1 })}`);
    }
  }
  for (let i = 0; i < texts.length; i++) {
    for (let j = i + 1; j < texts.length; j++) {
      const a = shrink(texts[i].box, tolerance / 2), b = shrink(texts[j].box, tolerance / 2);
      if (a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1) {
        found.push(`${texts[i].name} overlaps the text ${texts[j].name}`);
      }
    }
  }
  for (const t of texts) {
    const b = shrink(t.box, tolerance);
    for (const s of shapes) {
      if (t.symbol && t.symbol.contains(s.owner)) continue;
      let hit: Pt[] | null = null;
      for (const [p, q] of s.segs) {
        if (segBox(p, q, b) < s.halfWidth) {
          hit = [p, q];
          break;
        }
      }
      if (hit) {
        found.push(`${t.name} is crossed by the ${s.what} ${fmt(hit[0])}–${fmt(hit[1])}`);
      } else if (s.area && boxArea(b, s.area)) {
        found.push(`${t.name} lies on the ${s.what}`);
      }
    }
  }
  return found;
}
