/**
 * The element registry (lib/sim/registry.ts): the kinds, the element schema and the validator's rules come from one
 * list. Reference: the README's kinds table (engine: netlist format), the contract the netlist promises.
 */
import { describe, expect, it } from "vitest";
import { ELEMENT_KINDS, elementSchema, simulate, isSimError } from "@/lib/sim";

describe("element registry", () => {
  it("ELEMENT_KINDS lists the README's twelve kinds, in the table's order, and is the schema's own list", () => {
    expect([...ELEMENT_KINDS]).toEqual([
      "resistor", "capacitor", "inductor", "vsource", "isource", "vcvs", "vccs", "switch", "diode", "bjt", "mosfet", "opamp",
    ]);
    expect(elementSchema.options.map((o) => o.shape.kind.value)).toEqual([...ELEMENT_KINDS]);
  });
  it("an unknown kind is refused with the registry's kinds named", () => {
    try {
      simulate({ elements: [{ kind: "thyristor", name: "X1", nodes: ["a", "gnd"] } as never], analysis: { kind: "op" } });
      expect.unreachable();
    } catch (e) {
      expect(isSimError(e) && e.code).toBe("invalid");
      expect((e as Error).message).toContain(`expected one of ${ELEMENT_KINDS.join(", ")}`);
    }
  });
  it("each kind's topology rules apply: a capacitor gives no DC path, a voltage source loop is refused", () => {
    const floating = () => simulate({
      elements: [
        { kind: "vsource", name: "supply", nodes: ["a", "gnd"], dc: 1 },
        { kind: "capacitor", name: "block", nodes: ["a", "b"], value: 1e-9 },
        { kind: "resistor", name: "load", nodes: ["b", "c"], value: 1e3 },
      ],
      analysis: { kind: "op" },
    });
    expect(floating).toThrow(/node "b" is floating/);
    const loop = () => simulate({
      elements: [
        { kind: "vsource", name: "one", nodes: ["a", "gnd"], dc: 1 },
        { kind: "inductor", name: "short", nodes: ["a", "gnd"], value: 1e-3 },
      ],
      analysis: { kind: "op" },
    });
    expect(loop).toThrow(/closes a loop of voltage sources\/inductors/);
  });
});
