/**
 * The optional networks drawn in place: the coil clamp beside the coil, the load snubber beside the load, the
 * pass-device snubber and base–emitter (gate–source) resistor beside the pass device, the feedback-resistor
 * capacitor under the feedback resistor. Each layout says where its anchors are; each piece is a selectable part.
 */
import { formatEng } from "@/lib/units/eng";
import { usesGateDrive } from "@/lib/design/networks";
import type { ClampParams, Scenario } from "@/lib/design/schema";
import { Part, type Box } from "./parts";
import { Capacitor, Diode, INK, Resistor, Wire } from "./symbols";

const small = (x: number, y: number, text: string, anchor: "start" | "end" | "middle" = "start") => (
  <text x={x} y={y} fontSize={10.5} fill={INK} textAnchor={anchor} className="num" style={{ pointerEvents: "none" }}>{text}</text>
);

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

/** A vertical series R–C from (x, y1) to (x, y2), with the two values beside it. */
function SeriesRC({ x, y1, y2, resistance, capacitance, side }: { x: number; y1: number; y2: number; resistance: number; capacitance: number; side: "left" | "right" }) {
  const m = (y1 + y2) / 2;
  const tx = side === "right" ? x + 10 : x - 10;
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
  /** the load's two terminals: x of the load wire, top and bottom y */
  load?: { x: number; y1: number; y2: number; side?: "left" | "right" };
  /** pass device: collector/drain and emitter/source points, and the base/gate point */
  pass?: { cx: number; cy: number; ex: number; ey: number; bx: number; by: number };
  /** the feedback resistor's two ends (horizontal); the capacitor goes below it unless `above` */
  feedback?: { x1: number; x2: number; y: number; above?: boolean };
}

/** The fitted networks of the scenario, drawn at the layout's anchors. */
export function NetworkPieces({ s, anchors, sel, on }: { s: Scenario; anchors: NetworkAnchors; sel: string | null; on: (k: string) => void }) {
  const n = s.networks;
  const a = anchors;
  const gate = usesGateDrive(s);
  const box = (x: number, y: number, w: number, h: number): Box => [x, y, w, h];
  return (
    <g data-testid="schematic-networks">
      {n.loadSnubber && a.load && (() => {
        // narrow and without value text (the values are in its title and the panel); on the side the layout keeps
        // free of the load's label and the load supply; the clamp's wires (x ± 28) are joined, not crossed
        const L = a.load;
        const d = L.side === "left" ? -1 : 1;
        const xs = L.x + 54 * d;
        const x0 = L.side === "left" ? L.x : L.x + 28;
        return (
          <Part id="loadSnubber" label={`Load snubber ${formatEng(n.loadSnubber.resistance, "Ω")} + ${formatEng(n.loadSnubber.capacitance, "F")}`}
            box={box(Math.min(xs, L.x + 44 * d) - (d < 0 ? 10 : 0), L.y1, 22, L.y2 - L.y1)} selected={sel} onSelect={on}>
            <Wire d={[[L.x, L.y1 + 4], [x0, L.y1 + 4], [xs, L.y1 + 4], [xs, L.y1 + 8]]} />
            <Wire d={[[L.x, L.y2 - 4], [x0, L.y2 - 4], [xs, L.y2 - 4], [xs, L.y2 - 8]]} />
            <Resistor x1={xs} y1={L.y1 + 8} x2={xs} y2={(L.y1 + L.y2) / 2} />
            <Capacitor x1={xs} y1={(L.y1 + L.y2) / 2} x2={xs} y2={L.y2 - 8} />
          </Part>
        );
      })()}
      {n.passSnubber && a.pass && (() => {
        const d = Math.sign(a.pass.ey - a.pass.cy) || 1;
        const x = a.pass.cx + 44;
        return (
          <Part id="passSnubber" label={`Pass-device snubber ${formatEng(n.passSnubber.resistance, "Ω")} + ${formatEng(n.passSnubber.capacitance, "F")}`}
            box={box(a.pass.cx + 30, Math.min(a.pass.cy, a.pass.ey), 70, Math.abs(a.pass.ey - a.pass.cy))} selected={sel} onSelect={on}>
            <Wire d={[[a.pass.cx, a.pass.cy], [x, a.pass.cy], [x, a.pass.cy + 4 * d]]} />
            <Wire d={[[a.pass.ex, a.pass.ey], [x, a.pass.ey], [x, a.pass.ey - 4 * d]]} />
            <SeriesRC x={x} y1={a.pass.cy + 4 * d} y2={a.pass.ey - 4 * d} resistance={n.passSnubber.resistance} capacitance={n.passSnubber.capacitance} side="right" />
          </Part>
        );
      })()}
      {n.baseEmitterResistor !== null && a.pass && (
        <Part id="baseEmitterResistor" label={`${gate ? "Gate–source" : "Base–emitter"} resistor ${formatEng(n.baseEmitterResistor, "Ω")}`}
          box={box(a.pass.bx - 30, Math.min(a.pass.by, a.pass.ey), 28, Math.abs(a.pass.ey - a.pass.by))} selected={sel} onSelect={on}>
          <Wire d={[[a.pass.bx, a.pass.by], [a.pass.bx - 16, a.pass.by]]} />
          <Resistor x1={a.pass.bx - 16} y1={a.pass.by} x2={a.pass.bx - 16} y2={a.pass.ey} />
          <Wire d={[[a.pass.bx - 16, a.pass.ey], [a.pass.ex, a.pass.ey]]} />
          {small(a.pass.bx - 20, (a.pass.by + a.pass.ey) / 2 + 4, formatEng(n.baseEmitterResistor, "Ω"), "end")}
        </Part>
      )}
      {n.feedbackCapacitor !== null && a.feedback && (() => {
        const f = a.feedback;
        const yc = f.above ? f.y - 30 : f.y + 30;
        const mid = (f.x1 + f.x2) / 2;
        return (
          <Part id="feedbackCapacitor" label={`Feedback-resistor capacitor ${formatEng(n.feedbackCapacitor, "F")}`}
            box={box(f.x1, f.above ? yc - 14 : f.y + 18, f.x2 - f.x1, 32)} selected={sel} onSelect={on}>
            <Wire d={[[f.x1, f.y], [f.x1, yc], [mid - 10, yc]]} />
            <Capacitor x1={mid - 10} y1={yc} x2={mid + 10} y2={yc} />
            <Wire d={[[mid + 10, yc], [f.x2, yc], [f.x2, f.y]]} />
            {small(mid, f.above ? yc - 14 : yc + 16, formatEng(n.feedbackCapacitor, "F"), "middle")}
          </Part>
        );
      })()}
    </g>
  );
}
