import { describe, expect, it } from "vitest";
import { diffBodies, flatten } from "@/lib/design/diff";
import { valveCoilDemo } from "@/lib/design/demos";

// Expected rows are worked out by hand from the two literal bodies (definition of a key-by-key difference).
describe("scenario body diff", () => {
  it("flattens nested objects and arrays to dotted paths", () => {
    expect([...flatten({ parts: { senseResistor: 0.5 }, list: [1, { x: true }], empty: {} })]).toEqual([
      ["parts.senseResistor", 0.5],
      ["list.0", 1],
      ["list.1.x", true],
      ["empty", "{}"],
    ]);
  });

  it("lists changed, added and removed values with part values first", () => {
    const a = { template: "sink-npn", parts: { senseResistor: 1, baseResistor: 470 }, load: { resistance: 18 } };
    const b = { template: "sink-nmos", parts: { senseResistor: 0.5, baseResistor: 470, compCapacitor: 1e-9 }, load: {} };
    expect(diffBodies(a, b)).toEqual([
      { path: "parts.compCapacitor", before: undefined, after: 1e-9, kind: "added" },
      { path: "parts.senseResistor", before: 1, after: 0.5, kind: "changed" },
      { path: "load", before: undefined, after: "{}", kind: "added" },
      { path: "load.resistance", before: 18, after: undefined, kind: "removed" },
      { path: "template", before: "sink-npn", after: "sink-nmos", kind: "changed" },
    ]);
  });

  it("a network switched on lists its values against none (not a removed null beside added values)", () => {
    const a = { networks: { loadSnubber: null, feedbackCapacitor: null }, load: { clamp: { kind: "diode", zenerVoltage: 24 } } };
    const b = { networks: { loadSnubber: { resistance: 47, capacitance: 1e-6 }, feedbackCapacitor: null }, load: { clamp: { kind: "diode-zener", zenerVoltage: 24 } } };
    expect(diffBodies(a, b)).toEqual([
      { path: "networks.loadSnubber.capacitance", before: null, after: 1e-6, kind: "added" },
      { path: "networks.loadSnubber.resistance", before: null, after: 47, kind: "added" },
      { path: "load.clamp.kind", before: "diode", after: "diode-zener", kind: "changed" },
    ]);
    expect(diffBodies(b, a)).toEqual([
      { path: "networks.loadSnubber.capacitance", before: 1e-6, after: null, kind: "removed" },
      { path: "networks.loadSnubber.resistance", before: 47, after: null, kind: "removed" },
      { path: "load.clamp.kind", before: "diode-zener", after: "diode", kind: "changed" },
    ]);
  });

  it("finds nothing between equal bodies", () => {
    const s = { parts: { a: 1 }, x: [1, 2] };
    expect(diffBodies(s, structuredClone(s))).toEqual([]);
  });

  it("names each changed value of a whole scenario by its path", () => {
    const a = valveCoilDemo();
    const b = structuredClone(a);
    b.parts.compCapacitor = 4.7e-9;
    b.load.cable.length = 10;
    expect(diffBodies(a, b)).toEqual([
      { path: "parts.compCapacitor", before: a.parts.compCapacitor, after: 4.7e-9, kind: "changed" },
      { path: "load.cable.length", before: a.load.cable.length, after: 10, kind: "changed" },
    ]);
  });
});
