/** Netlist → compiled Circuit (node numbering, element instances, stamp positions). Done once per topology. */
import { Builder, Circuit, type Element } from "./circuit";
import { Bjt } from "./elements/bjt";
import { Diode } from "./elements/diode";
import { Capacitor, Inductor, ISource, Resistor, Switch, Vccs, Vcvs, VSource } from "./elements/linear";
import { Mosfet } from "./elements/mosfet";
import { Opamp } from "./elements/opamp";
import type { ParsedElement, ParsedNetlist } from "./schema";

function makeElement(e: ParsedElement): Element {
  switch (e.kind) {
    case "resistor": return new Resistor(e.name, e.nodes, e.value);
    case "capacitor": return new Capacitor(e.name, e.nodes, e.value, e.ic);
    case "inductor": return new Inductor(e.name, e.nodes, e.value, e.ic);
    case "vsource": return new VSource(e.name, e.nodes, e.dc, e.ac, e.acPhase, e.wave);
    case "isource": return new ISource(e.name, e.nodes, e.dc, e.ac, e.acPhase, e.wave);
    case "vcvs": return new Vcvs(e.name, e.nodes, e.control, e.gain);
    case "vccs": return new Vccs(e.name, e.nodes, e.control, e.gm);
    case "switch": return new Switch(e.name, e.nodes, e.ron, e.roff, e.schedule, e.transition);
    case "diode": return new Diode(e.name, e.nodes, e.model);
    case "bjt": return new Bjt(e.name, e.nodes, e.polarity, e.model);
    case "mosfet": return new Mosfet(e.name, e.nodes, e.polarity, e.model);
    case "opamp": return new Opamp(e.name, e.nodes, e.model);
  }
}

export function buildCircuit(n: ParsedNetlist): Circuit {
  const b = new Builder();
  const elements = n.elements.map(makeElement);
  for (const el of elements) el.setup(b);
  return new Circuit(b, elements, n.options, n.temperature);
}
