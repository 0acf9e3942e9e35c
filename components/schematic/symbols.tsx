/**
 * Schematic symbols drawn by us after the open standards IEC 60617 (resistor as a rectangle, capacitor as two
 * plates, inductor as semicircles, op-amp as a triangle) and IEEE 315 (transistor and diode shapes). Each symbol is
 * drawn in local coordinates between two terminals on a 10-unit grid; the caller places it with a transform.
 */
import type { ReactNode } from "react";

export const INK = "#1C2430";
export const STROKE = 1.6;

/** A wire through the given points. */
export function Wire({ d }: { d: [number, number][] }) {
  return (
    <polyline data-symbol="wire" points={d.map(([x, y]) => `${x},${y}`).join(" ")} fill="none" stroke={INK} strokeWidth={STROKE} strokeLinejoin="round" />
  );
}

/** A junction dot. */
export function Dot({ x, y }: { x: number; y: number }) {
  return <circle data-symbol="junction" cx={x} cy={y} r={2.6} fill={INK} />;
}

/** Resistor (IEC 60617-04-01-01): a rectangle, horizontal from (x1,y) to (x2,y) or vertical from (x,y1) to (x,y2). */
export function Resistor({ x1, y1, x2, y2 }: { x1: number; y1: number; x2: number; y2: number }) {
  const horizontal = y1 === y2;
  const len = horizontal ? x2 - x1 : y2 - y1;
  const body = Math.min(36, Math.abs(len) * 0.6);
  const lead = (Math.abs(len) - body) / 2;
  if (horizontal) {
    const a = Math.min(x1, x2);
    return (
      <g data-symbol="resistor">
        <line x1={a} y1={y1} x2={a + lead} y2={y1} stroke={INK} strokeWidth={STROKE} />
        <rect x={a + lead} y={y1 - 6} width={body} height={12} fill="white" stroke={INK} strokeWidth={STROKE} />
        <line x1={a + lead + body} y1={y1} x2={a + Math.abs(len)} y2={y1} stroke={INK} strokeWidth={STROKE} />
      </g>
    );
  }
  const a = Math.min(y1, y2);
  return (
    <g data-symbol="resistor">
      <line x1={x1} y1={a} x2={x1} y2={a + lead} stroke={INK} strokeWidth={STROKE} />
      <rect x={x1 - 6} y={a + lead} width={12} height={body} fill="white" stroke={INK} strokeWidth={STROKE} />
      <line x1={x1} y1={a + lead + body} x2={x1} y2={a + Math.abs(len)} stroke={INK} strokeWidth={STROKE} />
    </g>
  );
}

/** Capacitor (IEC 60617-04-02-01): two parallel plates, horizontal or vertical between the terminals. */
export function Capacitor({ x1, y1, x2, y2 }: { x1: number; y1: number; x2: number; y2: number }) {
  const horizontal = y1 === y2;
  if (horizontal) {
    const a = Math.min(x1, x2), b = Math.max(x1, x2), m = (a + b) / 2;
    return (
      <g data-symbol="capacitor">
        <line x1={a} y1={y1} x2={m - 3} y2={y1} stroke={INK} strokeWidth={STROKE} />
        <line x1={m - 3} y1={y1 - 10} x2={m - 3} y2={y1 + 10} stroke={INK} strokeWidth={2.2} />
        <line x1={m + 3} y1={y1 - 10} x2={m + 3} y2={y1 + 10} stroke={INK} strokeWidth={2.2} />
        <line x1={m + 3} y1={y1} x2={b} y2={y1} stroke={INK} strokeWidth={STROKE} />
      </g>
    );
  }
  const a = Math.min(y1, y2), b = Math.max(y1, y2), m = (a + b) / 2;
  return (
    <g data-symbol="capacitor">
      <line x1={x1} y1={a} x2={x1} y2={m - 3} stroke={INK} strokeWidth={STROKE} />
      <line x1={x1 - 10} y1={m - 3} x2={x1 + 10} y2={m - 3} stroke={INK} strokeWidth={2.2} />
      <line x1={x1 - 10} y1={m + 3} x2={x1 + 10} y2={m + 3} stroke={INK} strokeWidth={2.2} />
      <line x1={x1} y1={m + 3} x2={x1} y2={b} stroke={INK} strokeWidth={STROKE} />
    </g>
  );
}

/** Inductor (IEC 60617-04-03-01): four semicircles, vertical from (x,y1) down to (x,y2). */
export function Inductor({ x, y1, y2 }: { x: number; y1: number; y2: number }) {
  const len = y2 - y1;
  const body = Math.min(40, len * 0.7);
  const lead = (len - body) / 2;
  const r = body / 8;
  let d = `M ${x} ${y1} L ${x} ${y1 + lead}`;
  for (let i = 0; i < 4; i++) d += ` a ${r} ${r} 0 0 1 0 ${2 * r}`;
  d += ` L ${x} ${y2}`;
  return <path data-symbol="inductor" d={d} fill="none" stroke={INK} strokeWidth={STROKE} />;
}

/** Diode (IEC 60617-05-03-01), anode at y1, cathode at y2 (vertical), optional light arrows for an LED. */
export function Diode({ x, y1, y2, led = false }: { x: number; y1: number; y2: number; led?: boolean }) {
  const dir = Math.sign(y2 - y1) || 1;
  const m = (y1 + y2) / 2;
  const top = m - 7 * dir, bot = m + 7 * dir;
  return (
    <g data-symbol={led ? "LED" : "diode"}>
      <line x1={x} y1={y1} x2={x} y2={top} stroke={INK} strokeWidth={STROKE} />
      <polygon points={`${x - 8},${top} ${x + 8},${top} ${x},${bot}`} fill="white" stroke={INK} strokeWidth={STROKE} />
      <line x1={x - 8} y1={bot} x2={x + 8} y2={bot} stroke={INK} strokeWidth={STROKE} />
      <line x1={x} y1={bot} x2={x} y2={y2} stroke={INK} strokeWidth={STROKE} />
      {led && (
        <g stroke={INK} strokeWidth={1.2} fill="none">
          <path d={`M ${x + 10} ${m - 2} l 8 -6 m -4 0 l 4 0 l 0 3`} />
          <path d={`M ${x + 10} ${m + 5} l 8 -6 m -4 0 l 4 0 l 0 3`} />
        </g>
      )}
    </g>
  );
}

/** Ground (IEC 60617-02-15-01): three shortening bars below (x,y). */
export function Ground({ x, y }: { x: number; y: number }) {
  return (
    <g data-symbol="ground" stroke={INK} strokeWidth={STROKE}>
      <line x1={x} y1={y} x2={x} y2={y + 8} />
      <line x1={x - 10} y1={y + 8} x2={x + 10} y2={y + 8} />
      <line x1={x - 6} y1={y + 12} x2={x + 6} y2={y + 12} />
      <line x1={x - 2} y1={y + 16} x2={x + 2} y2={y + 16} />
    </g>
  );
}

/** Independent voltage source (IEC 60617-06-13-04 style: a circle crossed by the conductor), + at the top. */
export function VoltageSource({ x, y1, y2, label }: { x: number; y1: number; y2: number; label?: ReactNode }) {
  const m = (y1 + y2) / 2;
  return (
    <g data-symbol="source">
      <line x1={x} y1={y1} x2={x} y2={y2} stroke={INK} strokeWidth={STROKE} />
      <circle cx={x} cy={m} r={14} fill="white" stroke={INK} strokeWidth={STROKE} />
      <line x1={x} y1={m - 14} x2={x} y2={m + 14} stroke={INK} strokeWidth={STROKE} />
      <text x={x + 6} y={m - 17} fontSize={10} fill={INK}>+</text>
      {label}
    </g>
  );
}

/** Op-amp (IEC 60617-13-05-01 amplifier triangle): + input at (x, y-20), − input at (x, y+20), output at (x+80, y). */
export function OpAmp({ x, y }: { x: number; y: number }) {
  return (
    <g data-symbol="op-amp">
      <polygon points={`${x},${y - 40} ${x},${y + 40} ${x + 80},${y}`} fill="white" stroke={INK} strokeWidth={STROKE} strokeLinejoin="round" />
      <text x={x + 5} y={y - 16} fontSize={14} fill={INK}>+</text>
      <text x={x + 6} y={y + 25} fontSize={14} fill={INK}>−</text>
      <line x1={x + 40} y1={y - 20} x2={x + 40} y2={y - 34} stroke={INK} strokeWidth={STROKE} />
      <line x1={x + 40} y1={y + 20} x2={x + 40} y2={y + 34} stroke={INK} strokeWidth={STROKE} />
      <text x={x + 44} y={y - 26} fontSize={9} fill={INK}>V+</text>
      <text x={x + 44} y={y + 33} fontSize={9} fill={INK}>V−</text>
    </g>
  );
}

/**
 * Bipolar transistor (IEEE 315 §8): base at (x,y), collector at (x+30, y-40), emitter at (x+30, y+40); the arrow
 * on the emitter points out for NPN and in for PNP. For PNP the emitter is drawn at the top.
 */
export function Bjt({ x, y, pnp = false }: { x: number; y: number; pnp?: boolean }) {
  const ex = x + 30;
  // Emitter at the bottom for NPN, at the top for PNP.
  const ey = pnp ? y - 40 : y + 40;
  const cy = pnp ? y + 40 : y - 40;
  const edge = pnp ? y - 12 : y + 12;
  const cedge = pnp ? y + 12 : y - 12;
  // Arrow head on the emitter leg, 60 % of the way out from the bar.
  const ax = x + 12 + 0.6 * 18;
  const ay = edge + 0.6 * ((pnp ? y - 28 : y + 28) - edge);
  const ang = Math.atan2((pnp ? y - 28 : y + 28) - edge, 18) + (pnp ? Math.PI : 0);
  const head = (a: number) => `${ax + 8 * Math.cos(a)},${ay + 8 * Math.sin(a)}`;
  return (
    <g data-symbol={pnp ? "PNP" : "NPN"}>
      <circle cx={x + 18} cy={y} r={24} fill="white" stroke={INK} strokeWidth={1.2} />
      <line x1={x} y1={y} x2={x + 12} y2={y} stroke={INK} strokeWidth={STROKE} />
      <line x1={x + 12} y1={y - 15} x2={x + 12} y2={y + 15} stroke={INK} strokeWidth={2.4} />
      <polyline points={`${x + 12},${cedge} ${ex},${pnp ? y + 28 : y - 28} ${ex},${cy}`} fill="none" stroke={INK} strokeWidth={STROKE} />
      <polyline points={`${x + 12},${edge} ${ex},${pnp ? y - 28 : y + 28} ${ex},${ey}`} fill="none" stroke={INK} strokeWidth={STROKE} />
      <polygon points={`${ax},${ay} ${head(ang + Math.PI - 0.45)} ${head(ang + Math.PI + 0.45)}`} fill={INK} />
    </g>
  );
}

/**
 * Enhancement MOSFET (IEEE 315 §8, three-segment channel): gate at (x,y), drain at (x+30, y-40), source at
 * (x+30, y+40) for N-channel (arrow into the channel); for P-channel the source is at the top, arrow out.
 */
export function Mosfet({ x, y, p = false }: { x: number; y: number; p?: boolean }) {
  const cx = x + 16;
  const dy = p ? y + 40 : y - 40;
  const sy = p ? y - 40 : y + 40;
  const segD = p ? y + 12 : y - 12;
  const segS = p ? y - 12 : y + 12;
  return (
    <g data-symbol={p ? "P-MOSFET" : "N-MOSFET"}>
      <line x1={x} y1={y} x2={x + 10} y2={y} stroke={INK} strokeWidth={STROKE} />
      <line x1={x + 10} y1={y - 16} x2={x + 10} y2={y + 16} stroke={INK} strokeWidth={STROKE} />
      {[-12, 0, 12].map((o) => (
        <line key={o} x1={cx} y1={y + o - 5} x2={cx} y2={y + o + 5} stroke={INK} strokeWidth={2.4} />
      ))}
      <polyline points={`${cx},${segD} ${x + 30},${segD} ${x + 30},${dy}`} fill="none" stroke={INK} strokeWidth={STROKE} />
      <polyline points={`${cx},${segS} ${x + 30},${segS} ${x + 30},${sy}`} fill="none" stroke={INK} strokeWidth={STROKE} />
      <line x1={cx} y1={y} x2={x + 30} y2={y} stroke={INK} strokeWidth={STROKE} />
      <line x1={x + 30} y1={y} x2={x + 30} y2={segS} stroke={INK} strokeWidth={STROKE} />
      {p ? (
        <polygon points={`${x + 28},${y} ${x + 20},${y - 4} ${x + 20},${y + 4}`} fill={INK} />
      ) : (
        <polygon points={`${cx + 1},${y} ${cx + 9},${y - 4} ${cx + 9},${y + 4}`} fill={INK} />
      )}
    </g>
  );
}

/** Cable (IEC 60617-03-01 style): two conductors with a sheath ellipse, vertical from y1 to y2. */
export function Cable({ x, y1, y2 }: { x: number; y1: number; y2: number }) {
  const m = (y1 + y2) / 2;
  return (
    <g data-symbol="cable">
      <line x1={x} y1={y1} x2={x} y2={y2} stroke={INK} strokeWidth={STROKE} />
      <line x1={x + 8} y1={y1 + 6} x2={x + 8} y2={y2 - 6} stroke={INK} strokeWidth={STROKE} strokeDasharray="3 3" />
      <ellipse cx={x + 4} cy={m} rx={12} ry={5} fill="none" stroke={INK} strokeWidth={1.2} />
    </g>
  );
}

/** Cell (IEC 60617-06-15-01): long plate + short plate, vertical, positive (long plate) at the top. */
export function Cell({ x, y1, y2 }: { x: number; y1: number; y2: number }) {
  const m = (y1 + y2) / 2;
  return (
    <g data-symbol="cell">
      <line x1={x} y1={y1} x2={x} y2={m - 4} stroke={INK} strokeWidth={STROKE} />
      <line x1={x - 14} y1={m - 4} x2={x + 14} y2={m - 4} stroke={INK} strokeWidth={STROKE} />
      <line x1={x - 7} y1={m + 4} x2={x + 7} y2={m + 4} stroke={INK} strokeWidth={3} />
      <line x1={x} y1={m + 4} x2={x} y2={y2} stroke={INK} strokeWidth={STROKE} />
    </g>
  );
}
