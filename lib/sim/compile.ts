/** Netlist → compiled Circuit (node numbering, element instances, stamp positions). Done once per topology. */
import { Builder, Circuit } from "./circuit";
import { rulesOf } from "./registry";
import type { ParsedNetlist } from "./schema";

export function buildCircuit(n: ParsedNetlist): Circuit {
  const b = new Builder();
  const elements = n.elements.map((e) => {
    const el = rulesOf(e).create(e);
    if ("noiseless" in e && e.noiseless === true) el.noiseless = true;
    return el;
  });
  for (const el of elements) el.setup(b);
  return new Circuit(b, elements, n.options, n.temperature);
}
