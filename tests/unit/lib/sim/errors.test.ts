import { describe, expect, it } from "vitest";
import { compile, isSimError, parseNetlist, simulate, SimError, type Netlist } from "@/lib/sim";

function errorOf(fn: () => unknown): SimError {
  try {
    fn();
  } catch (e) {
    if (isSimError(e)) return e;
    throw e;
  }
  throw new Error("expected a SimError");
}

const ok: Netlist = {
  elements: [
    { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 1 },
    { kind: "resistor", name: "R1", nodes: ["a", "0"], value: 1000 },
  ],
  analysis: { kind: "op" },
};

describe("bad netlists get code \"invalid\" and a message naming the element and field", () => {
  it("unknown kind", () => {
    const e = errorOf(() => parseNetlist({ ...ok, elements: [...ok.elements, { kind: "thermistor", name: "TH1", nodes: ["a", "0"] }] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('"TH1"');
    expect(e.message).toContain('unknown kind "thermistor"');
    expect(e.message).toContain("resistor");
  });
  it("missing ground", () => {
    const e = errorOf(() => simulate({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["a", "b"], dc: 1 },
        { kind: "resistor", name: "R1", nodes: ["a", "b"], value: 1000 },
      ],
      analysis: { kind: "op" },
    }));
    expect(e.code).toBe("invalid");
    expect(e.message).toMatch(/ground.*"gnd".*"0"/);
  });
  it("\"gnd\" is accepted as ground", () => {
    const r = simulate({ ...ok, elements: [
      { kind: "vsource", name: "V1", nodes: ["a", "gnd"], dc: 2 },
      { kind: "resistor", name: "R1", nodes: ["a", "GND"], value: 1000 },
    ] });
    expect(r.kind === "op" && r.currents.R1).toBeCloseTo(2e-3, 15);
  });
  it("floating node (reached only through a capacitor)", () => {
    const e = errorOf(() => simulate({ ...ok, elements: [...ok.elements, { kind: "capacitor", name: "C1", nodes: ["a", "x"], value: 1e-9 }] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('node "x" is floating');
    expect(e.message).toContain('"C1"');
  });
  it("voltage-source loop (two sources in parallel) and a source shorted by an inductor", () => {
    let e = errorOf(() => simulate({ ...ok, elements: [...ok.elements, { kind: "vsource", name: "V2", nodes: ["a", "0"], dc: 2 }] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('"V2"');
    expect(e.message).toContain("loop of voltage sources");
    e = errorOf(() => simulate({ ...ok, elements: [...ok.elements, { kind: "inductor", name: "L1", nodes: ["0", "a"], value: 1e-3 }] }));
    expect(e.message).toContain('"L1"');
  });
  it("negative value", () => {
    const e = errorOf(() => simulate({ ...ok, elements: [ok.elements[0], { kind: "resistor", name: "R1", nodes: ["a", "0"], value: -5 }] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('"R1"');
    expect(e.message).toContain('field "value" must be > 0');
  });
  it("NaN and Infinity", () => {
    let e = errorOf(() => simulate({ ...ok, elements: [ok.elements[0], { kind: "resistor", name: "R1", nodes: ["a", "0"], value: NaN }] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('"R1"');
    expect(e.message).toContain('field "value" must be a finite number');
    e = errorOf(() => simulate({ ...ok, elements: [{ kind: "vsource", name: "V1", nodes: ["a", "0"], dc: Infinity }, ok.elements[1]] }));
    expect(e.message).toContain('"V1"');
    expect(e.message).toContain('field "dc"');
  });
  it("a misspelt model parameter is named, not silently ignored", () => {
    const e = errorOf(() => simulate({ ...ok, elements: [...ok.elements, { kind: "bjt", name: "Q7", nodes: ["a", "a", "0"], model: { betaf: 50 } } as never] }));
    expect(e.code).toBe("invalid");
    expect(e.message).toContain('"Q7"');
    expect(e.message).toContain('"betaf"');
  });
  it("duplicate names, bad sweep source, inverted AC range", () => {
    expect(errorOf(() => simulate({ ...ok, elements: [...ok.elements, { kind: "resistor", name: "R1", nodes: ["a", "0"], value: 1 }] })).message).toContain('"R1" is used twice');
    expect(errorOf(() => simulate({ ...ok, analysis: { kind: "dcsweep", source: "R1", from: 0, to: 1 } })).message).toContain('"analysis.source"');
    expect(errorOf(() => simulate({ ...ok, analysis: { kind: "ac", fStart: 1e3, fStop: 10 } })).message).toContain('"analysis.fStop"');
  });
  it("a missing analysis field is named", () => {
    const e = errorOf(() => simulate({ ...ok, analysis: { kind: "tran" } as never }));
    expect(e.message).toContain('"analysis.tStop"');
  });
});

describe("runtime failures", () => {
  it("a structurally valid but singular circuit (a VCVS fixing its own control voltage) gets \"singular\" naming the unknown", () => {
    const e = errorOf(() => simulate({
      elements: [
        { kind: "vcvs", name: "E1", nodes: ["o", "0"], control: ["o", "0"], gain: 1 },
        { kind: "resistor", name: "R1", nodes: ["o", "0"], value: 1000 },
      ],
      analysis: { kind: "op" },
    }));
    expect(e.code).toBe("singular");
    expect(e.message).toMatch(/node "o"|vcvs "E1"/);
  });
  it("shouldStop cancels a transient with code \"cancelled\"", () => {
    let calls = 0;
    const e = errorOf(() => simulate(
      { ...ok, elements: [...ok.elements, { kind: "capacitor", name: "C1", nodes: ["a", "0"], value: 1e-9 }], analysis: { kind: "tran", tStop: 1, maxStep: 1e-6 } },
      { shouldStop: () => ++calls > 3 },
    ));
    expect(e.code).toBe("cancelled");
  });
  it("the time budget ends a long transient with code \"budget\" and a clear message", () => {
    const e = errorOf(() => simulate(
      { ...ok, elements: [...ok.elements, { kind: "capacitor", name: "C1", nodes: ["a", "0"], value: 1e-9 }], analysis: { kind: "tran", tStop: 10, maxStep: 1e-7 } },
      { timeBudgetMs: 50 },
    ));
    expect(e.code).toBe("budget");
    expect(e.message).toMatch(/budget/i);
  });
  it("progress is reported and ends at 1", () => {
    const seen: number[] = [];
    simulate({ ...ok, elements: [...ok.elements, { kind: "capacitor", name: "C1", nodes: ["a", "0"], value: 1e-9 }], analysis: { kind: "tran", tStop: 1e-3, maxStep: 1e-6 } }, { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(3);
    expect(seen[seen.length - 1]).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
  });
  it("a compiled netlist runs other analyses on the same topology", () => {
    const c = compile(ok);
    const op = c.run();
    const sweep = c.run({}, { kind: "dcsweep", source: "V1", from: 0, to: 2, points: 3 });
    expect(op.kind === "op" && op.nodes.a).toBe(1);
    expect(sweep.kind === "dcsweep" && Array.from(sweep.nodes.a)).toEqual([0, 1, 2]);
  });
});
