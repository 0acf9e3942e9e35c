import { formatEng } from "@/lib/units/eng";
import { NetworkPieces } from "./networks";
import { Part, Label, Tag, LoadSymbol, loadText, r, c, type LayoutProps } from "./parts";
import { Bjt, Cable, Capacitor, Dot, Ground, Mosfet, OpAmp, Resistor, VoltageSource, Wire } from "./symbols";

/** High-side source: PNP or P-MOSFET, sense resistor from the rail to the emitter/source, grounded load. */
export function HighSideLayout({ s, sel, on, op }: LayoutProps) {
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
      <NetworkPieces s={s} sel={sel} on={on} anchors={{ load: { x: 410, y1: 280, y2: 356, side: "left" }, pass: { cx: 410, cy: 230, ex: 410, ey: 150, bx: 380, by: 190 }, feedback: { x1: 250, x2: 350, y: 110, above: true } }} />
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
