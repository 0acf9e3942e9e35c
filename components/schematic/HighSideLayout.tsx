import { formatEng } from "@/lib/units/eng";
import { NetworkPieces, type NetworkAnchors } from "./networks";
import { Part, Label, LoadLabel, Tag, LoadSymbol, loadText, r, c, type LayoutProps } from "./parts";
import { Bjt, Cable, Capacitor, Dot, Ground, Mosfet, OpAmp, Resistor, VoltageSource, Wire } from "./symbols";

/*
 * Where things are (viewBox units). The supply rail runs along y 40; the op-amp sits at (220, 190) with the feedback
 * resistor (y 110) and the compensation capacitor (y 140) over it; the pass device's emitter/source is at (430, 150)
 * under the sense resistor, its collector/drain at (430, 230) over the cable and the grounded load. Labels go where
 * the font's whole box (ascent to descent) clears every stroke.
 */
/** The sense, pass-device, cable and load column, x. */
const PASS_X = 430;
/** The feedback resistor's ends, over the op-amp. */
const FEEDBACK = { x1: 250, x2: 350, y: 110 };

/** High-side source: PNP or P-MOSFET, sense resistor from the rail to the emitter/source, grounded load. */
export function HighSideLayout({ s, sel, on, op }: LayoutProps) {
  const p = s.parts;
  const pmos = s.pass.kind === "pmos";
  const V = op?.nodes;
  const anchors: NetworkAnchors = {
    load: { x: PASS_X, y1: 280, y2: 356 },
    // the base–emitter resistor rises from the base lead to the emitter's wire, its value over that wire
    pass: { cx: PASS_X, cy: 230, ex: PASS_X, ey: 150, bx: 400, by: 190, baseEmitter: { x: 384, y1: 190, y2: 150, tee: false, value: [384, 144, "middle"] } },
    feedback: { ...FEEDBACK, above: true },
  };
  return (
    <g>
      <Wire d={[[60, 40], [520, 40], [520, 60]]} />
      <Part id="loadSupply" label={`Supply ${formatEng(s.supplies.load, "V")}`} box={[500, 54, 88, 64]} selected={sel} onSelect={on}>
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
      <Wire d={[[220, 210], [196, 210], [196, FEEDBACK.y], [FEEDBACK.x1, FEEDBACK.y]]} />
      <Dot x={196} y={140} />
      <Part id="feedbackResistor" label={`Feedback resistor ${r(p.feedbackResistor)}`} box={[FEEDBACK.x1, 82, FEEDBACK.x2 - FEEDBACK.x1, 36]} selected={sel} onSelect={on}>
        <Resistor x1={FEEDBACK.x1} y1={FEEDBACK.y} x2={FEEDBACK.x2} y2={FEEDBACK.y} />
        <Label x={(FEEDBACK.x1 + FEEDBACK.x2) / 2} y={FEEDBACK.y - 13} anchor="middle">{r(p.feedbackResistor)}</Label>
      </Part>
      <Wire d={[[FEEDBACK.x2, FEEDBACK.y], [PASS_X, FEEDBACK.y]]} />
      <Part id="compCapacitor" label={`Compensation capacitor ${c(p.compCapacitor)}`} box={[198, 122, 126, 30]} selected={sel} onSelect={on}>
        <Wire d={[[196, 140], [226, 140]]} />
        <Capacitor x1={226} y1={140} x2={266} y2={140} />
        {/* above and right of the capacitor, clear of the op-amp body */}
        <Label x={270} y={133}>{c(p.compCapacitor)}</Label>
      </Part>
      <Wire d={[[266, 140], [310, 140], [310, 190]]} />
      <Wire d={[[300, 190], [310, 190]]} />
      <Dot x={310} y={190} />
      <Part id="baseResistor" label={`${pmos ? "Gate" : "Base"} resistor ${r(p.baseResistor)}`} box={[312, 164, 76, 34]} selected={sel} onSelect={on}>
        <Resistor x1={310} y1={190} x2={400} y2={190} />
        {/* over the resistor, ending with its body: right of that rises the base–emitter resistor */}
        <Label x={373} y={179} anchor="end">{r(p.baseResistor)}</Label>
      </Part>
      <Part id="senseResistor" label={`Sense resistor ${r(p.senseResistor)}`} box={[416, 44, 86, 62]} selected={sel} onSelect={on}>
        <Resistor x1={PASS_X} y1={40} x2={PASS_X} y2={110} />
        <Label x={PASS_X + 12} y={78}>{r(p.senseResistor)}</Label>
      </Part>
      <Dot x={PASS_X} y={110} />
      <Wire d={[[PASS_X, 110], [PASS_X, 150]]} />
      <Part id="pass" label={`Pass device: ${s.pass.preset}`} box={[398, 146, 54, 88]} selected={sel} onSelect={on}>
        {pmos ? <Mosfet x={400} y={190} p /> : <Bjt x={400} y={190} pnp />}
      </Part>
      <Part id="cable" label={`Cable ${formatEng(s.load.cable.length, "m")}`} box={[320, 232, 124, 46]} selected={sel} onSelect={on}>
        <Cable x={PASS_X} y1={230} y2={280} />
        <Label x={PASS_X - 18} y={259} anchor="end">{s.load.cable.length > 0 ? `cable ${formatEng(s.load.cable.length, "m")}` : "no cable"}</Label>
      </Part>
      <Part id="load" label={`Load: ${loadText(s)}`} box={[330, 282, 120, 74]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={PASS_X} y1={280} y2={356} />
        <LoadLabel s={s} x={PASS_X - 18} y={318} />
      </Part>
      <Ground x={PASS_X} y={356} />
      <NetworkPieces s={s} sel={sel} on={on} anchors={anchors} />
      {V && (
        <g>
          <Tag x={154} y={164} v={V.ref} anchor="end" />
          {/* the output, under the base resistor: over it sits the resistor's value, in the triangle its pins */}
          <Tag x={314} y={210} v={V.oa} />
          <Tag x={PASS_X + 6} y={130} v={V.e} />
          {/* the collector, left of its lead and under the device */}
          <Tag x={PASS_X - 4} y={229} v={V.c} anchor="end" />
        </g>
      )}
    </g>
  );
}
