import { formatEng } from "@/lib/units/eng";
import { NetworkPieces } from "./networks";
import { Part, Label, Tag, LoadSymbol, loadText, r, c, type LayoutProps } from "./parts";
import { Bjt, Cable, Capacitor, Dot, Ground, Mosfet, OpAmp, Resistor, VoltageSource, Wire } from "./symbols";

/** Low-side sinks: NPN, Darlington, N-MOSFET. */
export function SinkLayout({ s, sel, on, op }: LayoutProps) {
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
      <NetworkPieces s={s} sel={sel} on={on} anchors={{ load: { x: 410, y1: 40, y2: 120 }, pass: dar ? { cx: 410, cy: 190, ex: 410, ey: 310, bx: 340, by: 230 } : { cx: 410, cy: 190, ex: 410, ey: 270, bx: 380, by: 230 }, feedback: { x1: 240, x2: 340, y: 310 } }} />
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
