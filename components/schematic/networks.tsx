/**
 * The optional networks drawn in place: the coil clamp beside the coil, the load snubber beside the load, the
 * pass-device snubber and base–emitter (gate–source) resistor beside the pass device, the feedback-resistor
 * capacitor under (or over) the feedback resistor. Each layout says where its anchors are and where the values it
 * has room for go; each piece is a selectable part. Every value label keeps clear of wires, symbols and other labels
 * (tests/e2e/schematic-labels.e2e.ts measures it).
 */
import { formatEng } from "@/lib/units/eng";
import { usesGateDrive } from "@/lib/design/networks";
import type { ClampParams, Scenario } from "@/lib/design/schema";
import { Label, Part, type Box, type TextAnchor } from "./parts";
import { Capacitor, Diode, Dot, INK, Resistor, Wire } from "./symbols";

const small = (x: number, y: number, text: string, anchor: TextAnchor = "start") => <Label x={x} y={y} anchor={anchor} small>{text}</Label>;

/** Clamp across the coil (x is the load's wire; y1 the supply-side end, y2 the pass-device end). */
export function ClampSymbol({ clamp, x, y1, y2 }: { clamp: ClampParams; x: number; y1: number; y2: number }) {
  if (clamp.kind === "none") return null;
  const m = (y1 + y2) / 2;
  return (
    <g data-testid="schematic-clamp">
      <Wire d={[[x, y1 + 4], [x + 28, y1 + 4]]} />
      <Wire d={[[x, y2 - 4], [x + 28, y2 - 4]]} />
      {clamp.kind === "diode" ? (
        <Diode x={x + 28} y1={y2 - 4} y2={y1 + 4} />
      ) : (
        <g>
          <Diode x={x + 28} y1={y2 - 4} y2={m} />
          {/* the Zener: conducts in reverse, its cathode toward the diode's */}
          <Diode x={x + 28} y1={y1 + 4} y2={m} />
          <path d={`M ${x + 20} ${m - 11} l -3 -3 M ${x + 36} ${m - 11} l 3 3`} stroke={INK} strokeWidth={1.2} />
          {/* the voltage in the title only: to the right sits the load snubber, to the left the load's own label */}
          <title>{`Clamp: diode + ${Number(clamp.zenerVoltage.toPrecision(3))} V Zener`}</title>
        </g>
      )}
    </g>
  );
}

/** How far a value stands off a vertical symbol's axis: clear of a capacitor's plates (±10) and their stroke. */
const VALUE_OFFSET = 14;

/** A vertical series R–C from (x, y1) to (x, y2), with the two values beside it. */
function SeriesRC({ x, y1, y2, resistance, capacitance, side }: { x: number; y1: number; y2: number; resistance: number; capacitance: number; side: "left" | "right" }) {
  const m = (y1 + y2) / 2;
  const tx = side === "right" ? x + VALUE_OFFSET : x - VALUE_OFFSET;
  const anchor = side === "right" ? "start" : "end";
  return (
    <g>
      <Resistor x1={x} y1={y1} x2={x} y2={m} />
      <Capacitor x1={x} y1={m} x2={x} y2={y2} />
      {small(tx, (y1 + m) / 2 + 4, formatEng(resistance, "Ω"), anchor)}
      {small(tx, (m + y2) / 2 + 4, formatEng(capacitance, "F"), anchor)}
    </g>
  );
}

/** Where a layout's networks attach, in its own coordinates. */
export interface NetworkAnchors {
  /** the load's two terminals: x of the load wire, top and bottom y; the snubber goes right of it, the label left */
  load?: { x: number; y1: number; y2: number };
  /** pass device: collector/drain and emitter/source points, and the base/gate point */
  pass?: {
    cx: number; cy: number; ex: number; ey: number; bx: number; by: number;
    /**
     * The base–emitter (gate–source) resistor: an upright at x, joined to the base lead by a wire, the resistor
     * from y1 to y2 with y2 on the emitter's node — a tee on a wire already drawn there (`tee`), or a corner with
     * a wire across to the emitter — and where its value goes.
     */
    baseEmitter: { x: number; y1: number; y2: number; tee: boolean; value: [number, number, TextAnchor] };
  };
  /** the feedback resistor's two ends (horizontal); the capacitor goes below it unless `above`, its value beyond it */
  feedback?: { x1: number; x2: number; y: number; above?: boolean };
}

/** The pass snubber's upright stands this far right of the collector: its values then clear the collector's tag. */
const PASS_SNUBBER_OFFSET = 64;
/** The load snubber's upright, right of the load: beyond the clamp's wires (x + 28), which it joins. */
const LOAD_SNUBBER_OFFSET = 54;
/** The feedback-resistor capacitor sits this far from the resistor: room for the resistor's value between them. */
const FEEDBACK_CAPACITOR_OFFSET = 40;

/** The fitted networks of the scenario, drawn at the layout's anchors. */
export function NetworkPieces({ s, anchors, sel, on }: { s: Scenario; anchors: NetworkAnchors; sel: string | null; on: (k: string) => void }) {
  const n = s.networks;
  const a = anchors;
  const gate = usesGateDrive(s);
  const box = (x: number, y: number, w: number, h: number): Box => [x, y, w, h];
  return (
    <g data-testid="schematic-networks">
      {n.loadSnubber && a.load && (() => {
        // narrow and without value text (the values are in its title and the panel); right of the load, the side
        // every layout keeps free of the load's label; the clamp's wires (x + 28) are joined, not crossed
        const L = a.load;
        const xs = L.x + LOAD_SNUBBER_OFFSET;
        return (
          <Part id="loadSnubber" label={`Load snubber ${formatEng(n.loadSnubber.resistance, "Ω")} + ${formatEng(n.loadSnubber.capacitance, "F")}`}
            box={box(xs - 11, L.y1, 22, L.y2 - L.y1)} selected={sel} onSelect={on}>
            <Wire d={[[L.x, L.y1 + 4], [xs, L.y1 + 4], [xs, L.y1 + 8]]} />
            <Wire d={[[L.x, L.y2 - 4], [xs, L.y2 - 4], [xs, L.y2 - 8]]} />
            <Resistor x1={xs} y1={L.y1 + 8} x2={xs} y2={(L.y1 + L.y2) / 2} />
            <Capacitor x1={xs} y1={(L.y1 + L.y2) / 2} x2={xs} y2={L.y2 - 8} />
          </Part>
        );
      })()}
      {n.passSnubber && a.pass && (() => {
        const d = Math.sign(a.pass.ey - a.pass.cy) || 1;
        const x = a.pass.cx + PASS_SNUBBER_OFFSET;
        return (
          <Part id="passSnubber" label={`Pass-device snubber ${formatEng(n.passSnubber.resistance, "Ω")} + ${formatEng(n.passSnubber.capacitance, "F")}`}
            box={box(x - 12, Math.min(a.pass.cy, a.pass.ey), 70, Math.abs(a.pass.ey - a.pass.cy))} selected={sel} onSelect={on}>
            <Wire d={[[a.pass.cx, a.pass.cy], [x, a.pass.cy], [x, a.pass.cy + 4 * d]]} />
            <Wire d={[[a.pass.ex, a.pass.ey], [x, a.pass.ey], [x, a.pass.ey - 4 * d]]} />
            <SeriesRC x={x} y1={a.pass.cy + 4 * d} y2={a.pass.ey - 4 * d} resistance={n.passSnubber.resistance} capacitance={n.passSnubber.capacitance} side="right" />
          </Part>
        );
      })()}
      {n.baseEmitterResistor !== null && a.pass && (() => {
        const p = a.pass;
        const be = p.baseEmitter;
        return (
          <Part id="baseEmitterResistor" label={`${gate ? "Gate–source" : "Base–emitter"} resistor ${formatEng(n.baseEmitterResistor, "Ω")}`}
            box={box(be.x - 10, Math.min(p.by, be.y2), 20, Math.abs(be.y2 - p.by))} selected={sel} onSelect={on}>
            <Wire d={[[p.bx, p.by], [be.x, p.by], [be.x, be.y1]]} />
            <Dot x={be.x} y={p.by} />
            <Resistor x1={be.x} y1={be.y1} x2={be.x} y2={be.y2} />
            {be.tee ? <Dot x={be.x} y={be.y2} /> : <Wire d={[[be.x, be.y2], [p.ex, be.y2]]} />}
            {small(be.value[0], be.value[1], formatEng(n.baseEmitterResistor, "Ω"), be.value[2])}
          </Part>
        );
      })()}
      {n.feedbackCapacitor !== null && a.feedback && (() => {
        const f = a.feedback;
        const yc = f.above ? f.y - FEEDBACK_CAPACITOR_OFFSET : f.y + FEEDBACK_CAPACITOR_OFFSET;
        const mid = (f.x1 + f.x2) / 2;
        // the value beyond the plates (±10), clear of them by its font's ascent or descent
        const valueY = f.above ? yc - 15 : yc + 23;
        return (
          <Part id="feedbackCapacitor" label={`Feedback-resistor capacitor ${formatEng(n.feedbackCapacitor, "F")}`}
            box={box(f.x1, f.above ? yc - 26 : yc - 12, f.x2 - f.x1, 38)} selected={sel} onSelect={on}>
            <Wire d={[[f.x1, f.y], [f.x1, yc], [mid - 10, yc]]} />
            <Capacitor x1={mid - 10} y1={yc} x2={mid + 10} y2={yc} />
            <Wire d={[[mid + 10, yc], [f.x2, yc], [f.x2, f.y]]} />
            {small(mid, valueY, formatEng(n.feedbackCapacitor, "F"), "middle")}
          </Part>
        );
      })()}
    </g>
  );
}
