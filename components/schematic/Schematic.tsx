"use client";
/**
 * The circuit of the chosen template, drawn as SVG with our IEC 60617 / IEEE 315 symbols. Every part is a button:
 * clicking it (or Enter/Space on it) selects it and focuses its value field. With the operating point at hand,
 * node voltages and the load current are written beside the nodes.
 */
import type { KeyboardEvent, ReactNode } from "react";
import { formatEng } from "@/lib/units/eng";
import type { Scenario } from "@/lib/design/schema";
import {
  Bjt, Cable, Capacitor, Cell, Diode, Dot, Ground, INK, Inductor, Mosfet, OpAmp, Resistor, VoltageSource, Wire,
} from "./symbols";

/** What the overlay needs from an operating point: node voltages and element currents, SI. */
export interface OperatingPointView {
  nodes: Record<string, number>;
  currents: Record<string, number>;
  devices?: Record<string, object>;
}

/** Branch currents and device figures worth reading off the operating point, as one line. */
function opSummary(op: OperatingPointView): string {
  const parts: string[] = [];
  const ib = op.currents.RBASE;
  if (ib !== undefined) parts.push(`I(drive) ${formatEng(Math.abs(ib), "A")}`);
  let p = 0;
  let any = false;
  for (const name of ["Q1", "Q2", "M1"]) {
    const d = op.devices?.[name] as { power?: number } | undefined;
    if (d?.power !== undefined) {
      p += d.power;
      any = true;
    }
  }
  if (any) parts.push(`P(pass) ${formatEng(p, "W")}`);
  const u = op.devices?.U1 as { limiting?: boolean } | undefined;
  if (u?.limiting) parts.push("op-amp limiting");
  return parts.join(" · ");
}

export interface SchematicProps {
  scenario: Scenario;
  selected: string | null;
  onSelect: (key: string) => void;
  op: OperatingPointView | null;
  showOp: boolean;
}

type Box = [number, number, number, number];

function Part(props: { id: string; label: string; box: Box; selected: string | null; onSelect: (k: string) => void; children: ReactNode }) {
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

function Label({ x, y, children, anchor = "start" }: { x: number; y: number; children: ReactNode; anchor?: "start" | "middle" | "end" }) {
  return (
    <text x={x} y={y} fontSize={12.5} fill={INK} textAnchor={anchor} className="num" style={{ pointerEvents: "none" }}>
      {children}
    </text>
  );
}

function Tag({ x, y, v, anchor = "start" }: { x: number; y: number; v: number | undefined; anchor?: "start" | "middle" | "end" }) {
  if (v === undefined || !Number.isFinite(v)) return null;
  return (
    <text x={x} y={y} fontSize={12} fill="#0F766E" fontWeight={600} textAnchor={anchor} className="num" data-testid="op-tag">
      {formatEng(v, "V")}
    </text>
  );
}

const r = (v: number) => formatEng(v, "Ω");
const c = (v: number) => (v > 0 ? formatEng(v, "F") : "none");

function LoadSymbol({ s, x, y1, y2 }: { s: Scenario; x: number; y1: number; y2: number }) {
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
          {L.clampDiode && (
            <g>
              <Wire d={[[x, y1 + 4], [x + 28, y1 + 4]]} />
              <Wire d={[[x, y2 - 4], [x + 28, y2 - 4]]} />
              <Diode x={x + 28} y1={y2 - 4} y2={y1 + 4} />
            </g>
          )}
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

function loadText(s: Scenario): string {
  const L = s.load;
  switch (L.kind) {
    case "resistor": return `${r(L.resistance)}`;
    case "coil": return `${r(L.resistance)} + ${formatEng(L.inductance, "H")}`;
    case "led": return `${L.ledCount} LEDs + ${r(L.resistance)}`;
    case "cell": return `cell ${formatEng(L.cellVoltage, "V")}, ${r(L.resistance)}`;
  }
}

/** Low-side sinks: NPN, Darlington, N-MOSFET. */
function Sink({ s, sel, on, op }: { s: Scenario; sel: string | null; on: (k: string) => void; op: OperatingPointView | null }) {
  const p = s.parts;
  const dar = s.template === "sink-darlington";
  const mos = s.template === "sink-nmos";
  const V = op?.nodes;
  return (
    <g>
      {/* command source and divider */}
      <Part id="command" label="Command source (stimulus)" box={[14, 222, 52, 76]} selected={sel} onSelect={on}>
        <VoltageSource x={40} y1={210} y2={290} />
        <Label x={18} y={316}>cmd</Label>
      </Part>
      <Ground x={40} y={290} />
      <Part id="dividerTop" label={`Divider top ${r(p.dividerTop)}`} box={[62, 196, 80, 28]} selected={sel} onSelect={on}>
        <Wire d={[[40, 210], [60, 210]]} />
        <Resistor x1={60} y1={210} x2={140} y2={210} />
        <Label x={100} y={194} anchor="middle">{r(p.dividerTop)}</Label>
      </Part>
      <Wire d={[[140, 210], [220, 210]]} />
      <Dot x={160} y={210} />
      <Part id="dividerBottom" label={`Divider bottom ${r(p.dividerBottom)}`} box={[96, 222, 76, 66]} selected={sel} onSelect={on}>
        <Resistor x1={160} y1={210} x2={160} y2={290} />
        {/* left of the resistor: on the right it ran into the compensation capacitor's value */}
        <Label x={150} y={262} anchor="end">{r(p.dividerBottom)}</Label>
      </Part>
      <Ground x={160} y={290} />
      {/* op-amp */}
      <Part id="opamp" label={`Op-amp: ${s.opamp.preset}`} box={[214, 188, 92, 84]} selected={sel} onSelect={on}>
        <OpAmp x={220} y={230} />
      </Part>
      {/* feedback network: Rf from the sense node, Cc from the output to −in */}
      <Wire d={[[220, 250], [190, 250], [190, 310], [240, 310]]} />
      <Dot x={190} y={280} />
      <Part id="feedbackResistor" label={`Feedback resistor ${r(p.feedbackResistor)}`} box={[238, 296, 104, 34]} selected={sel} onSelect={on}>
        <Resistor x1={240} y1={310} x2={340} y2={310} />
        <Label x={290} y={326} anchor="middle">{r(p.feedbackResistor)}</Label>
      </Part>
      <Wire d={[[340, 310], [410, 310]]} />
      <Part id="compCapacitor" label={`Compensation capacitor ${c(p.compCapacitor)}`} box={[192, 266, 96, 35]} selected={sel} onSelect={on}>
        <Wire d={[[190, 280], [220, 280]]} />
        <Capacitor x1={220} y1={280} x2={260} y2={280} />
        {/* below the capacitor, between it and the feedback resistor: left of it the text crossed the −in wire */}
        <Label x={240} y={299} anchor="middle">{c(p.compCapacitor)}</Label>
      </Part>
      <Wire d={[[260, 280], [310, 280], [310, 230]]} />
      <Wire d={[[300, 230], dar ? [310, 230] : [310, 230]]} />
      <Dot x={310} y={230} />
      <Part id="baseResistor" label={`${mos ? "Gate" : "Base"} resistor ${r(p.baseResistor)}`} box={[312, 216, dar ? 34 : 66, 28]} selected={sel} onSelect={on}>
        <Resistor x1={310} y1={230} x2={dar ? 340 : 380} y2={230} />
        {dar ? <Label x={338} y={219} anchor="end">{r(p.baseResistor)}</Label> : <Label x={345} y={212} anchor="middle">{r(p.baseResistor)}</Label>}
      </Part>
      {/* pass device */}
      <Part id="pass" label={`Pass device: ${s.pass.preset}`} box={dar ? [338, 186, 90, 130] : [378, 186, 54, 88]} selected={sel} onSelect={on}>
        {mos ? (
          <Mosfet x={380} y={230} />
        ) : dar ? (
          <g>
            <Bjt x={340} y={230} />
            <Wire d={[[370, 190], [370, 180], [410, 180], [410, 230]]} />
            <Wire d={[[370, 270], [380, 270]]} />
            <Bjt x={380} y={270} />
          </g>
        ) : (
          <Bjt x={380} y={230} />
        )}
      </Part>
      {dar && p.darlingtonResistor !== null && (
        <Part id="darlingtonResistor" label={`Output B–E resistor ${r(p.darlingtonResistor)}`} box={[330, 272, 34, 36]} selected={sel} onSelect={on}>
          <Wire d={[[370, 270], [370, 276], [352, 276]]} />
          <Resistor x1={352} y1={276} x2={352} y2={310} />
        </Part>
      )}
      {/* sense node and resistor */}
      <Wire d={[[410, dar ? 310 : 270], [410, 310]]} />
      <Dot x={410} y={310} />
      <Part id="senseResistor" label={`Sense resistor ${r(p.senseResistor)}`} box={[396, 318, 86, 52]} selected={sel} onSelect={on}>
        <Resistor x1={410} y1={310} x2={410} y2={370} />
        <Label x={422} y={346}>{r(p.senseResistor)}</Label>
      </Part>
      <Ground x={410} y={370} />
      {/* cable, load and load supply */}
      <Part id="cable" label={`Cable ${formatEng(s.load.cable.length, "m")}`} box={[310, 122, 130, 54]} selected={sel} onSelect={on}>
        <Cable x={410} y1={120} y2={dar ? 180 : 190} />
        <Label x={392} y={158} anchor="end">{s.load.cable.length > 0 ? `cable ${formatEng(s.load.cable.length, "m")}` : "no cable"}</Label>
      </Part>
      <Part id="load" label={`Load: ${loadText(s)}`} box={[290, 42, 160, 76]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={410} y1={40} y2={120} />
        <Label x={392} y={84} anchor="end">{loadText(s)}</Label>
      </Part>
      <Wire d={[[410, 40], [410, 30], [520, 30], [520, 50]]} />
      <Part id="loadSupply" label={`Load supply ${formatEng(s.supplies.load, "V")}`} box={[500, 44, 78, 74]} selected={sel} onSelect={on}>
        <VoltageSource x={520} y1={50} y2={110} />
        <Label x={540} y={84}>{formatEng(s.supplies.load, "V")}</Label>
      </Part>
      <Ground x={520} y={110} />
      {V && (
        <g>
          <Tag x={160} y={204} v={V.ref ?? V.cmd} anchor="middle" />
          {/* inside the triangle, near the apex: above the output wire it ran over the symbol's edge */}
          <Tag x={260} y={234} v={V.oa} anchor="middle" />
          {!dar && <Tag x={372} y={252} v={V.b} anchor="end" />}
          <Tag x={416} y={300} v={V.e} />
          <Tag x={416} y={dar ? 176 : 200} v={V.c} />
        </g>
      )}
    </g>
  );
}

/** High-side source: PNP or P-MOSFET, sense resistor from the rail to the emitter/source, grounded load. */
function HighSide({ s, sel, on, op }: { s: Scenario; sel: string | null; on: (k: string) => void; op: OperatingPointView | null }) {
  const p = s.parts;
  const pmos = s.pass.kind === "pmos";
  const V = op?.nodes;
  return (
    <g>
      <Wire d={[[60, 40], [520, 40], [520, 60]]} />
      <Part id="loadSupply" label={`Supply ${formatEng(s.supplies.load, "V")}`} box={[500, 54, 56, 64]} selected={sel} onSelect={on}>
        <VoltageSource x={520} y1={60} y2={110} />
        <Label x={540} y={90}>{formatEng(s.supplies.load, "V")}</Label>
      </Part>
      <Ground x={520} y={110} />
      <Part id="command" label="Command source (stimulus), referred to the rail" box={[34, 120, 52, 80]} selected={sel} onSelect={on}>
        <VoltageSource x={60} y1={40} y2={260} />
      </Part>
      <Wire d={[[60, 260], [160, 260]]} />
      <Dot x={160} y={40} />
      <Part id="dividerBottom" label={`Divider (rail side) ${r(p.dividerBottom)}`} box={[96, 52, 70, 96]} selected={sel} onSelect={on}>
        <Resistor x1={160} y1={40} x2={160} y2={170} />
        <Label x={150} y={110} anchor="end">{r(p.dividerBottom)}</Label>
      </Part>
      <Dot x={160} y={170} />
      <Part id="dividerTop" label={`Divider (command side) ${r(p.dividerTop)}`} box={[96, 182, 70, 70]} selected={sel} onSelect={on}>
        <Resistor x1={160} y1={170} x2={160} y2={260} />
        <Label x={150} y={222} anchor="end">{r(p.dividerTop)}</Label>
      </Part>
      <Wire d={[[160, 170], [220, 170]]} />
      <Part id="opamp" label={`Op-amp: ${s.opamp.preset}`} box={[214, 148, 92, 84]} selected={sel} onSelect={on}>
        <OpAmp x={220} y={190} />
      </Part>
      <Wire d={[[220, 210], [196, 210], [196, 110], [250, 110]]} />
      <Dot x={196} y={140} />
      <Part id="feedbackResistor" label={`Feedback resistor ${r(p.feedbackResistor)}`} box={[248, 96, 104, 30]} selected={sel} onSelect={on}>
        <Resistor x1={250} y1={110} x2={350} y2={110} />
        <Label x={300} y={96} anchor="middle">{r(p.feedbackResistor)}</Label>
      </Part>
      <Wire d={[[350, 110], [410, 110]]} />
      <Part id="compCapacitor" label={`Compensation capacitor ${c(p.compCapacitor)}`} box={[198, 126, 96, 28]} selected={sel} onSelect={on}>
        <Wire d={[[196, 140], [226, 140]]} />
        <Capacitor x1={226} y1={140} x2={266} y2={140} />
        {/* above and right of the capacitor, clear of the op-amp body */}
        <Label x={270} y={133}>{c(p.compCapacitor)}</Label>
      </Part>
      <Wire d={[[266, 140], [310, 140], [310, 190]]} />
      <Wire d={[[300, 190], [310, 190]]} />
      <Dot x={310} y={190} />
      <Part id="baseResistor" label={`${pmos ? "Gate" : "Base"} resistor ${r(p.baseResistor)}`} box={[312, 176, 66, 28]} selected={sel} onSelect={on}>
        <Resistor x1={310} y1={190} x2={380} y2={190} />
        <Label x={345} y={214} anchor="middle">{r(p.baseResistor)}</Label>
      </Part>
      <Part id="senseResistor" label={`Sense resistor ${r(p.senseResistor)}`} box={[396, 44, 86, 62]} selected={sel} onSelect={on}>
        <Resistor x1={410} y1={40} x2={410} y2={110} />
        <Label x={422} y={78}>{r(p.senseResistor)}</Label>
      </Part>
      <Dot x={410} y={110} />
      <Wire d={[[410, 110], [410, 150]]} />
      <Part id="pass" label={`Pass device: ${s.pass.preset}`} box={[378, 146, 54, 88]} selected={sel} onSelect={on}>
        {pmos ? <Mosfet x={380} y={190} p /> : <Bjt x={380} y={190} pnp />}
      </Part>
      <Part id="cable" label={`Cable ${formatEng(s.load.cable.length, "m")}`} box={[396, 232, 70, 50]} selected={sel} onSelect={on}>
        <Cable x={410} y1={230} y2={280} />
        <Label x={430} y={262}>{s.load.cable.length > 0 ? `cable ${formatEng(s.load.cable.length, "m")}` : "no cable"}</Label>
      </Part>
      <Part id="load" label={`Load: ${loadText(s)}`} box={[380, 282, 120, 76]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={410} y1={280} y2={356} />
        <Label x={448} y={324}>{loadText(s)}</Label>
      </Part>
      <Ground x={410} y={356} />
      {V && (
        <g>
          <Tag x={154} y={164} v={V.ref} anchor="end" />
          <Tag x={306} y={182} v={V.oa} anchor="end" />
          <Tag x={416} y={126} v={V.e} />
          <Tag x={416} y={226} v={V.c} />
        </g>
      )}
    </g>
  );
}

/** Improved Howland pump. */
function Howland({ s, sel, on, op }: { s: Scenario; sel: string | null; on: (k: string) => void; op: OperatingPointView | null }) {
  const p = s.parts;
  const V = op?.nodes;
  return (
    <g>
      <Part id="command" label="Command source (stimulus)" box={[14, 222, 52, 76]} selected={sel} onSelect={on}>
        <VoltageSource x={40} y1={210} y2={290} />
      </Part>
      <Ground x={40} y={290} />
      <Part id="howlandR1" label={`R1 ${r(p.howlandR1)}`} box={[62, 196, 80, 28]} selected={sel} onSelect={on}>
        <Wire d={[[40, 210], [60, 210]]} />
        <Resistor x1={60} y1={210} x2={140} y2={210} />
        <Label x={100} y={194} anchor="middle">R1 {r(p.howlandR1)}</Label>
      </Part>
      <Wire d={[[140, 210], [220, 210]]} />
      <Dot x={160} y={210} />
      <Wire d={[[160, 210], [160, 120], [250, 120]]} />
      <Part id="howlandR2" label={`R2 ${r(p.howlandR2)}`} box={[248, 106, 104, 30]} selected={sel} onSelect={on}>
        <Resistor x1={250} y1={120} x2={350} y2={120} />
        <Label x={300} y={106} anchor="middle">R2 {r(p.howlandR2)}</Label>
      </Part>
      <Wire d={[[350, 120], [450, 120], [450, 230]]} />
      <Part id="opamp" label={`Op-amp: ${s.opamp.preset}`} box={[214, 188, 92, 84]} selected={sel} onSelect={on}>
        <OpAmp x={220} y={230} />
      </Part>
      <Wire d={[[220, 250], [130, 250]]} />
      <Dot x={190} y={250} />
      <Part id="howlandR3" label={`R3 ${r(p.howlandR3)}`} box={[116, 262, 70, 64]} selected={sel} onSelect={on}>
        <Resistor x1={130} y1={250} x2={130} y2={330} />
        <Label x={122} y={290} anchor="end">R3</Label>
        <Label x={122} y={305} anchor="end">{r(p.howlandR3)}</Label>
      </Part>
      <Ground x={130} y={330} />
      <Wire d={[[190, 250], [190, 340]]} />
      <Dot x={190} y={300} />
      <Part id="howlandR4" label={`R4 ${r(p.howlandR4)}`} box={[196, 286, 108, 30]} selected={sel} onSelect={on}>
        <Resistor x1={190} y1={300} x2={310} y2={300} />
        <Label x={250} y={292} anchor="middle">R4 {r(p.howlandR4)}</Label>
      </Part>
      <Part id="compCapacitor" label={`Compensation capacitor ${c(p.compCapacitor)}`} box={[196, 326, 108, 30]} selected={sel} onSelect={on}>
        <Wire d={[[190, 340], [230, 340]]} />
        <Capacitor x1={230} y1={340} x2={270} y2={340} />
        <Wire d={[[270, 340], [310, 340]]} />
        <Label x={250} y={366} anchor="middle">{c(p.compCapacitor)}</Label>
      </Part>
      <Wire d={[[310, 340], [310, 230]]} />
      <Wire d={[[300, 230], [320, 230]]} />
      <Dot x={310} y={230} />
      <Dot x={310} y={300} />
      <Part id="senseResistor" label={`Sense resistor ${r(p.senseResistor)}`} box={[322, 216, 110, 30]} selected={sel} onSelect={on}>
        <Resistor x1={320} y1={230} x2={430} y2={230} />
        <Label x={375} y={216} anchor="middle">Rs {r(p.senseResistor)}</Label>
      </Part>
      <Wire d={[[430, 230], [450, 230], [450, 240]]} />
      <Dot x={450} y={230} />
      <Part id="cable" label={`Cable ${formatEng(s.load.cable.length, "m")}`} box={[436, 240, 70, 44]} selected={sel} onSelect={on}>
        <Cable x={450} y1={240} y2={280} />
      </Part>
      <Part id="load" label={`Load: ${loadText(s)}`} box={[420, 282, 130, 76]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={450} y1={280} y2={356} />
        <Label x={476} y={324}>{loadText(s)}</Label>
      </Part>
      <Ground x={450} y={356} />
      {V && (
        <g>
          <Tag x={166} y={204} v={V.p} />
          <Tag x={306} y={222} v={V.oa} anchor="end" />
          <Tag x={456} y={222} v={V.c} />
        </g>
      )}
    </g>
  );
}

export function Schematic({ scenario, selected, onSelect, op, showOp }: SchematicProps) {
  const view = showOp ? op : null;
  const loadCurrent = view?.currents.VMEAS;
  return (
    <svg
      viewBox="0 0 590 400"
      className="h-auto w-full select-none"
      role="group"
      aria-label="Circuit schematic"
      data-testid="schematic"
    >
      {scenario.template === "howland" ? (
        <Howland s={scenario} sel={selected} on={onSelect} op={view} />
      ) : scenario.template === "source-highside" ? (
        <HighSide s={scenario} sel={selected} on={onSelect} op={view} />
      ) : (
        <Sink s={scenario} sel={selected} on={onSelect} op={view} />
      )}
      {view && (
        <text x={6} y={394} fontSize={12} fill="#0F766E" className="num" data-testid="op-summary">{opSummary(view)}</text>
      )}
      {view && loadCurrent !== undefined && (
        <text x={586} y={394} fontSize={12.5} textAnchor="end" fill="#0F766E" fontWeight={600} className="num">
          I(load) = {formatEng(loadCurrent, "A")}
        </text>
      )}
    </svg>
  );
}
