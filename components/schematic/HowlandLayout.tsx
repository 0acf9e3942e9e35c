import { formatEng } from "@/lib/units/eng";
import { NetworkPieces } from "./networks";
import { Part, Label, LoadLabel, Tag, LoadSymbol, loadText, r, c, type LayoutProps } from "./parts";
import { Cable, Capacitor, Dot, Ground, OpAmp, Resistor, VoltageSource, Wire } from "./symbols";

/** Improved Howland pump. */
export function HowlandLayout({ s, sel, on, op }: LayoutProps) {
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
      <Part id="howlandR3" label={`R3 ${r(p.howlandR3)}`} box={[66, 262, 70, 64]} selected={sel} onSelect={on}>
        <Resistor x1={130} y1={250} x2={130} y2={330} />
        {/* two lines a line's height apart (the command source's ground is left of them) */}
        <Label x={120} y={286} anchor="end">R3</Label>
        <Label x={120} y={304} anchor="end">{r(p.howlandR3)}</Label>
      </Part>
      <Ground x={130} y={330} />
      <Wire d={[[190, 250], [190, 340]]} />
      <Dot x={190} y={300} />
      <Part id="howlandR4" label={`R4 ${r(p.howlandR4)}`} box={[196, 272, 108, 34]} selected={sel} onSelect={on}>
        <Resistor x1={190} y1={300} x2={310} y2={300} />
        <Label x={250} y={288} anchor="middle">R4 {r(p.howlandR4)}</Label>
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
      <Part id="load" label={`Load: ${loadText(s)}`} box={[350, 282, 130, 76]} selected={sel} onSelect={on}>
        <LoadSymbol s={s} x={450} y1={280} y2={356} />
        {/* left of the load, in the room between it and the R4–Cc loop; the clamp and the snubber are on its right */}
        <LoadLabel s={s} x={432} y={318} />
      </Part>
      <Ground x={450} y={356} />
      <NetworkPieces s={s} sel={sel} on={on} anchors={{ load: { x: 450, y1: 280, y2: 356 } }} />
      {V && (
        <g>
          <Tag x={166} y={204} v={V.p} />
          {/* the output, under the wire to Rs: clear of the triangle */}
          <Tag x={314} y={250} v={V.oa} />
          <Tag x={456} y={222} v={V.c} />
        </g>
      )}
    </g>
  );
}
