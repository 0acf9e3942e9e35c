import { formatEng } from "@/lib/units/eng";
import { NetworkPieces, type NetworkAnchors } from "./networks";
import { Part, Label, LoadLabel, Tag, LoadSymbol, loadText, r, c, type LayoutProps } from "./parts";
import { Bjt, Cable, Capacitor, Dot, Ground, Mosfet, OpAmp, Resistor, VoltageSource, Wire } from "./symbols";

/*
 * Where things are (viewBox units). The op-amp sits at (200, 200): + in at y 180 (the divider tap), − in at y 220,
 * output at (280, 200). The compensation capacitor runs at y 260 and the feedback resistor at y 310 below it, each
 * with its value underneath; the pass device's collector/drain is at x 420 with the load above it and the sense
 * resistor below. Labels go where the font's whole box (ascent to descent) clears every stroke.
 */
/** The collector/drain, cable, load and sense column, x. */
const PASS_X = 420;
/** The sense node, y: the emitter/source, the feedback resistor and the base–emitter resistor meet there. */
const SENSE_Y = 310;
/** The feedback resistor's ends, from − in's wire to the sense node's. */
const FEEDBACK = { x1: 220, x2: 320, y: SENSE_Y };

/** Low-side sinks: NPN, Darlington, N-MOSFET. */
export function SinkLayout({ s, sel, on, op }: LayoutProps) {
  const p = s.parts;
  const dar = s.template === "sink-darlington";
  const mos = s.template === "sink-nmos";
  const V = op?.nodes;
  // the base/gate resistor ends at the pass device's base, or for a Darlington at the node before the driver's base
  const baseEnd = dar ? 330 : 390;
  // the Darlington's collectors join at y 150, so its cable is shorter
  const cableEnd = dar ? 150 : 160;
  const emitter = dar ? 280 : 240;
  const anchors: NetworkAnchors = {
    load: { x: PASS_X, y1: 40, y2: 120 },
    pass: dar
      ? { cx: PASS_X, cy: 160, ex: PASS_X, ey: emitter, bx: 340, by: 200, baseEmitter: { x: 330, y1: 262, y2: SENSE_Y, tee: true, value: [320, 290, "end"] } }
      : { cx: PASS_X, cy: 160, ex: PASS_X, ey: emitter, bx: 390, by: 200, baseEmitter: { x: 374, y1: 262, y2: SENSE_Y, tee: true, value: [364, 290, "end"] } },
    feedback: FEEDBACK,
  };
  return (
    <g>
      {/* command source and divider */}
      <Part id="command" label="Command source (stimulus)" box={[8, 184, 50, 76]} selected={sel} onSelect={on}>
        <VoltageSource x={40} y1={180} y2={260} />
        {/* left of the source's upper lead, between the wire and the circle: below the source was the ground */}
        <Label x={34} y={199} anchor="end">cmd</Label>
      </Part>
      <Ground x={40} y={260} />
      <Part id="dividerTop" label={`Divider top ${r(p.dividerTop)}`} box={[56, 150, 70, 38]} selected={sel} onSelect={on}>
        <Wire d={[[40, 180], [60, 180]]} />
        <Resistor x1={60} y1={180} x2={120} y2={180} />
        <Label x={90} y={164} anchor="middle">{r(p.dividerTop)}</Label>
      </Part>
      <Wire d={[[120, 180], [200, 180]]} />
      <Dot x={140} y={180} />
      <Part id="dividerBottom" label={`Divider bottom ${r(p.dividerBottom)}`} box={[76, 194, 72, 66]} selected={sel} onSelect={on}>
        <Resistor x1={140} y1={180} x2={140} y2={260} />
        <Label x={130} y={232} anchor="end">{r(p.dividerBottom)}</Label>
      </Part>
      <Ground x={140} y={260} />
      {/* op-amp */}
      <Part id="opamp" label={`Op-amp: ${s.opamp.preset}`} box={[194, 158, 92, 84]} selected={sel} onSelect={on}>
        <OpAmp x={200} y={200} />
      </Part>
      {/* feedback network: Rf from the sense node, Cc from the output to −in */}
      <Wire d={[[200, 220], [170, 220], [170, FEEDBACK.y], [FEEDBACK.x1, FEEDBACK.y]]} />
      <Dot x={170} y={260} />
      <Part id="feedbackResistor" label={`Feedback resistor ${r(p.feedbackResistor)}`} box={[FEEDBACK.x1, 296, FEEDBACK.x2 - FEEDBACK.x1, 42]} selected={sel} onSelect={on}>
        <Resistor x1={FEEDBACK.x1} y1={FEEDBACK.y} x2={FEEDBACK.x2} y2={FEEDBACK.y} />
        <Label x={(FEEDBACK.x1 + FEEDBACK.x2) / 2} y={FEEDBACK.y + 21} anchor="middle">{r(p.feedbackResistor)}</Label>
      </Part>
      <Wire d={[[FEEDBACK.x2, FEEDBACK.y], [PASS_X, FEEDBACK.y]]} />
      <Part id="compCapacitor" label={`Compensation capacitor ${c(p.compCapacitor)}`} box={[172, 246, 96, 46]} selected={sel} onSelect={on}>
        <Wire d={[[170, 260], [200, 260]]} />
        <Capacitor x1={200} y1={260} x2={240} y2={260} />
        {/* under the capacitor: its plates reach 10 below the wire, the feedback resistor is 50 below */}
        <Label x={220} y={285} anchor="middle">{c(p.compCapacitor)}</Label>
      </Part>
      <Wire d={[[240, 260], [290, 260], [290, 200]]} />
      <Wire d={[[280, 200], [290, 200]]} />
      <Dot x={290} y={200} />
      <Part id="baseResistor" label={`${mos ? "Gate" : "Base"} resistor ${r(p.baseResistor)}`} box={[292, 172, baseEnd - 292, 36]} selected={sel} onSelect={on}>
        <Resistor x1={290} y1={200} x2={baseEnd} y2={200} />
        {/* over the resistor; a Darlington's ends short of the driver's circle */}
        {dar ? <Label x={baseEnd} y={189} anchor="end">{r(p.baseResistor)}</Label> : <Label x={(290 + baseEnd) / 2} y={189} anchor="middle">{r(p.baseResistor)}</Label>}
      </Part>
      {/* pass device */}
      <Part id="pass" label={`Pass device: ${s.pass.preset}`} box={dar ? [330, 146, 114, 136] : [384, 156, 56, 88]} selected={sel} onSelect={on}>
        {mos ? (
          <Mosfet x={390} y={200} />
        ) : dar ? (
          <g>
            <Wire d={[[330, 200], [340, 200]]} />
            <Bjt x={340} y={200} />
            <Wire d={[[370, 160], [370, 150], [PASS_X, 150], [PASS_X, 200]]} />
            <Wire d={[[370, 240], [390, 240]]} />
            <Bjt x={390} y={240} />
          </g>
        ) : (
          <Bjt x={390} y={200} />
        )}
      </Part>
      {dar && p.darlingtonResistor !== null && (
        <Part id="darlingtonResistor" label={`Output B–E resistor ${r(p.darlingtonResistor)}`} box={[368, 238, 54, 62]} selected={sel} onSelect={on}>
          {/* from the output transistor's base down and across to its emitter, under its circle */}
          <Dot x={376} y={240} />
          <Wire d={[[376, 240], [376, 290]]} />
          <Resistor x1={376} y1={290} x2={PASS_X} y2={290} />
          <Dot x={PASS_X} y={290} />
          {/* right of the column, below the pass snubber's lower wire (y 280); the emitter tag moves under it */}
          <Label x={PASS_X + 6} y={297} small>{r(p.darlingtonResistor)}</Label>
        </Part>
      )}
      {/* sense node and resistor */}
      <Wire d={[[PASS_X, emitter], [PASS_X, SENSE_Y]]} />
      <Dot x={PASS_X} y={SENSE_Y} />
      <Part id="senseResistor" label={`Sense resistor ${r(p.senseResistor)}`} box={[406, 318, 86, 52]} selected={sel} onSelect={on}>
        <Resistor x1={PASS_X} y1={SENSE_Y} x2={PASS_X} y2={370} />
        <Label x={PASS_X + 12} y={346}>{r(p.senseResistor)}</Label>
      </Part>
      <Ground x={PASS_X} y={370} />
      {/* cable, load and load supply */}
      <Part id="cable" label={`Cable ${formatEng(s.load.cable.length, "m")}`} box={[310, 122, 130, cableEnd - 122]} selected={sel} onSelect={on}>
        <Cable x={PASS_X} y1={120} y2={cableEnd} />
        <Label x={PASS_X - 18} y={(120 + cableEnd) / 2 + 4} anchor="end">{s.load.cable.length > 0 ? `cable ${formatEng(s.load.cable.length, "m")}` : "no cable"}</Label>
      </Part>
      <Part id="load" label={`Load: ${loadText(s)}`} box={[300, 42, 160, 76]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={PASS_X} y1={40} y2={120} />
        <LoadLabel s={s} x={PASS_X - 18} y={80} />
      </Part>
      <Wire d={[[PASS_X, 40], [PASS_X, 30], [520, 30], [520, 50]]} />
      <Part id="loadSupply" label={`Load supply ${formatEng(s.supplies.load, "V")}`} box={[500, 44, 88, 74]} selected={sel} onSelect={on}>
        <VoltageSource x={520} y1={50} y2={110} />
        <Label x={540} y={84}>{formatEng(s.supplies.load, "V")}</Label>
      </Part>
      <Ground x={520} y={110} />
      <NetworkPieces s={s} sel={sel} on={on} anchors={anchors} />
      {V && (
        <g>
          {/* the divider tap, over the wire to + in */}
          <Tag x={146} y={174} v={V.ref ?? V.cmd} />
          {/* the output, inside the loop the compensation capacitor closes: clear of the triangle and its V− pin */}
          <Tag x={286} y={249} v={V.oa} anchor="end" />
          {!dar && <Tag x={370} y={220} v={V.b} anchor="end" />}
          <Tag x={PASS_X + 6} y={dar && p.darlingtonResistor !== null ? 314 : 300} v={V.e} />
          {dar ? <Tag x={PASS_X + 6} y={196} v={V.c} /> : <Tag x={PASS_X - 4} y={170} v={V.c} anchor="end" />}
        </g>
      )}
    </g>
  );
}
