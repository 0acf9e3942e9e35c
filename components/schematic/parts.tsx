/**
 * The pieces every schematic layout is drawn with: a selectable part, value labels, operating-point tags and the
 * load symbol of the scenario's load kind.
 */
import type { OperatingPointData } from "@/lib/design/op-words";
import type { KeyboardEvent, ReactNode } from "react";
import { formatEng } from "@/lib/units/eng";
import type { Scenario } from "@/lib/design/schema";
import { ClampSymbol } from "./networks";
import { Cell, Diode, INK, Inductor, Resistor, Wire } from "./symbols";

/** What the overlay needs from an operating point: node voltages and element currents, SI (devices optional). */
export type OperatingPointView = Omit<OperatingPointData, "devices"> & Partial<Pick<OperatingPointData, "devices">>;

/** What each layout draws from: the scenario, the selected part, the select callback and the operating point. */
export interface LayoutProps {
  s: Scenario;
  sel: string | null;
  on: (k: string) => void;
  op: OperatingPointView | null;
}

export type Box = [number, number, number, number];

export type TextAnchor = "start" | "middle" | "end";

export function Part(props: { id: string; label: string; box: Box; selected: string | null; onSelect: (k: string) => void; children: ReactNode }) {
  const { id, label, box, selected, onSelect, children } = props;
  const on = selected === id;
  const key = (e: KeyboardEvent) => {
    if (e.key === "Enter" || e.key === " ") {
      e.preventDefault();
      onSelect(id);
    }
  };
  return (
    <g
      role="button"
      tabIndex={0}
      aria-label={label}
      aria-pressed={on}
      data-part={id}
      data-testid={`schematic-${id}`}
      className="cursor-pointer outline-none [&:focus-visible>rect.hl]:stroke-signal"
      onClick={() => onSelect(id)}
      onKeyDown={key}
    >
      <rect
        className="hl"
        x={box[0]} y={box[1]} width={box[2]} height={box[3]} rx={6}
        fill={on ? "#CCE7E4" : "transparent"} stroke={on ? "#0F766E" : "transparent"} strokeWidth={1.5}
      />
      {children}
      <title>{label}</title>
    </g>
  );
}

/** A part's value; `small` for the optional networks' values, drawn where there is less room. */
export function Label({ x, y, children, anchor = "start", small = false }: { x: number; y: number; children: ReactNode; anchor?: TextAnchor; small?: boolean }) {
  return (
    <text x={x} y={y} fontSize={small ? 10.5 : 12.5} fill={INK} textAnchor={anchor} className="num" style={{ pointerEvents: "none" }}>
      {children}
    </text>
  );
}

export function Tag({ x, y, v, anchor = "start" }: { x: number; y: number; v: number | undefined; anchor?: TextAnchor }) {
  if (v === undefined || !Number.isFinite(v)) return null;
  return (
    <text x={x} y={y} fontSize={12} fill="#0F766E" fontWeight={600} textAnchor={anchor} className="num" data-testid="op-tag">
      {formatEng(v, "V")}
    </text>
  );
}

export const r = (v: number) => formatEng(v, "Ω");
export const c = (v: number) => (v > 0 ? formatEng(v, "F") : "none");

export function LoadSymbol({ s, x, y1, y2 }: { s: Scenario; x: number; y1: number; y2: number }) {
  const L = s.load;
  const m = (y1 + y2) / 2;
  switch (L.kind) {
    case "resistor":
      return <Resistor x1={x} y1={y1} x2={x} y2={y2} />;
    case "coil":
      return (
        <g>
          <Resistor x1={x} y1={y1} x2={x} y2={m} />
          <Inductor x={x} y1={m} y2={y2} />
          <ClampSymbol clamp={L.clamp} x={x} y1={y1} y2={y2} />
        </g>
      );
    case "led":
      return (
        <g>
          <Diode x={x} y1={y1} y2={m + 4} led />
          {/* right of the string (the load's value label sits on the left) */}
          <text x={x + 12} y={m + 14} fontSize={10} fill={INK}>×{L.ledCount}</text>
          <Resistor x1={x} y1={m + 4} x2={x} y2={y2} />
        </g>
      );
    case "cell":
      return (
        <g>
          <Cell x={x} y1={y1} y2={m} />
          <Resistor x1={x} y1={m} x2={x} y2={y2} />
        </g>
      );
  }
}

/** The load's value label in lines: a long one (coil, LED string, cell) in two, so it fits beside the load. */
export function loadLines(s: Scenario): string[] {
  const L = s.load;
  switch (L.kind) {
    case "resistor": return [r(L.resistance)];
    case "coil": return [r(L.resistance), `+ ${formatEng(L.inductance, "H")}`];
    case "led": return [`${L.ledCount} LEDs`, `+ ${r(L.resistance)}`];
    case "cell": return [`cell ${formatEng(L.cellVoltage, "V")}`, `+ ${r(L.resistance)}`];
  }
}

/**
 * Space between the baselines of a label's lines: the font box of a 12.5-unit label (ascent to descent) is about 17
 * units, so its lines neither touch nor drift apart.
 */
const LINE_PITCH = 18;

/** The load's value beside the load: its lines stacked about y (the middle of the load), ending at x. */
export function LoadLabel({ s, x, y }: { s: Scenario; x: number; y: number }) {
  const lines = loadLines(s);
  const first = y + 4 - ((lines.length - 1) * LINE_PITCH) / 2;
  return (
    <>
      {lines.map((line, i) => (
        <Label key={i} x={x} y={first + i * LINE_PITCH} anchor="end">{line}</Label>
      ))}
    </>
  );
}

/** The load's value on one line (the part's accessible name): the label's lines run together. */
export function loadText(s: Scenario): string {
  return loadLines(s).join(" ");
}
