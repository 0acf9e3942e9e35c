import { describe, expect, it } from "vitest";
import { compile, isSimError, simulate, type AcResult, type Netlist, type NetlistElement, type OpResult } from "@/lib/sim";
import { referenceSink } from "./fixtures/sink";

/**
 * Multi-excitation AC (CompiledNetlist.runAcMulti): one operating point, one linearisation and one factorisation per
 * frequency shared by several right-hand sides. Checks: each set equals a separate AC run of the netlist with that
 * set's source values (the matrix (G + jωC) does not depend on the AC sources, so the numbers must agree to
 * rounding); superposition (the small-signal system is linear: the sum of the one-source responses equals the
 * response to both sources at once); an RC low-pass against H = 1/(1 + jωRC); the returned OP equals a fresh OP.
 */

function relClose(a: number, b: number, scale: number, tol = 1e-12): void {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(tol * scale);
}

function compareAc(got: AcResult, want: AcResult): void {
  expect(Array.from(got.freq)).toEqual(Array.from(want.freq));
  for (const [name, col] of Object.entries(want.nodes)) {
    const g = got.nodes[name];
    let scale = 1e-30;
    for (let k = 0; k < col.re.length; k++) scale = Math.max(scale, Math.hypot(col.re[k], col.im[k]));
    for (let k = 0; k < col.re.length; k++) { relClose(g.re[k], col.re[k], scale); relClose(g.im[k], col.im[k], scale); }
  }
  for (const [name, col] of Object.entries(want.currents)) {
    const g = got.currents[name];
    let scale = 1e-30;
    for (let k = 0; k < col.re.length; k++) scale = Math.max(scale, Math.hypot(col.re[k], col.im[k]));
    for (let k = 0; k < col.re.length; k++) { relClose(g.re[k], col.re[k], scale); relClose(g.im[k], col.im[k], scale); }
  }
}

/** The reference sink with a series voltage probe at the op-amp output and a shunt current probe injecting into it. */
function probedSink(vAc: number, iAc: number, iPhase = 0): Netlist {
  const n = referenceSink({ kind: "ac", fStart: 10, fStop: 1e7, pointsPerDecade: 10 });
  const u = n.elements.find((e) => e.kind === "opamp");
  if (!u || u.kind !== "opamp") throw new Error("reference sink: op-amp missing");
  const out = u.nodes[2];
  // the example excites the command with AC 1: off here, so only the probes drive the small-signal system
  for (const e of n.elements) if (e.kind === "vsource" && e.name === "command") e.ac = 0;
  u.nodes = [u.nodes[0], u.nodes[1], "probe_i", u.nodes[3], u.nodes[4]];
  const extra: NetlistElement[] = [
    { kind: "vsource", name: "VPR", nodes: [out, "probe_i"], dc: 0, ac: vAc },
    { kind: "isource", name: "IPR", nodes: ["0", out], dc: 0, ac: iAc, acPhase: iPhase },
  ];
  return { ...n, elements: [...n.elements, ...extra] };
}

function ac(n: Netlist): AcResult {
  const r = simulate(n);
  if (r.kind !== "ac") throw new Error("expected ac");
  return r;
}

describe("runAcMulti", () => {
  it("each excitation set equals a separate AC run of the reference sink (1e-12 relative)", () => {
    const c = compile(probedSink(0, 0));
    const { results } = c.runAcMulti([
      { VPR: { ac: 1 }, IPR: { ac: 0 } },
      { VPR: { ac: 0 }, IPR: { ac: 1, acPhase: 30 } },
    ]);
    expect(results.length).toBe(2);
    compareAc(results[0], ac(probedSink(1, 0)));
    compareAc(results[1], ac(probedSink(0, 1, 30)));
  });

  it("unnamed sources keep the netlist's AC values; the sum of one-source responses equals both at once", () => {
    const c = compile(probedSink(1, 0));
    const { results } = c.runAcMulti([{}, { VPR: { ac: 0 }, IPR: { ac: 1 } }, { IPR: { ac: 1 } }]);
    compareAc(results[0], ac(probedSink(1, 0)));
    // superposition: linear small-signal system
    const both = results[2];
    // rounding is relative to the largest node response (a node the probes barely reach sits near 1e-20 V)
    let scale = 1e-30;
    for (const s of Object.values(both.nodes)) for (let k = 0; k < s.re.length; k++) scale = Math.max(scale, Math.hypot(s.re[k], s.im[k]));
    for (const name of Object.keys(both.nodes)) {
      const a = results[0].nodes[name], b = results[1].nodes[name], s = both.nodes[name];
      for (let k = 0; k < s.re.length; k++) { relClose(a.re[k] + b.re[k], s.re[k], scale, 1e-9); relClose(a.im[k] + b.im[k], s.im[k], scale, 1e-9); }
    }
    // the compiled netlist's own AC values are restored afterwards
    const again = c.run();
    if (again.kind !== "ac") throw new Error("expected ac");
    compareAc(again, results[0]);
  });

  it("the returned operating point equals a fresh operating point", () => {
    const n = probedSink(0, 0);
    const { op } = compile(n).runAcMulti([{ VPR: { ac: 1 } }]);
    const fresh = simulate({ ...n, analysis: { kind: "op" } }) as OpResult;
    expect(fresh.kind).toBe("op");
    for (const [k, v] of Object.entries(fresh.nodes)) expect(op.nodes[k]).toBe(v);
    for (const [k, v] of Object.entries(fresh.currents)) expect(op.currents[k]).toBe(v);
  });

  it("RC low-pass: both sets follow H = 1/(1 + jωRC) scaled by their source (first-order RC, closed form)", () => {
    const R = 1e3, C = 1e-6;
    const c = compile({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 0, ac: 1 },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: R },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: C },
      ],
      analysis: { kind: "ac", fStart: 1, fStop: 1e5, pointsPerDecade: 5 },
    });
    const { results } = c.runAcMulti([{}, { V1: { ac: 2, acPhase: 90 } }]);
    for (const [j, gain] of [[0, [1, 0]], [1, [0, 2]]] as const) {
      const r = results[j];
      for (let k = 0; k < r.freq.length; k++) {
        const wrc = 2 * Math.PI * r.freq[k] * R * C;
        const d = 1 + wrc * wrc;
        const hr = 1 / d, hi = -wrc / d; // 1/(1 + jωRC)
        const er = gain[0] * hr - gain[1] * hi, ei = gain[0] * hi + gain[1] * hr;
        const m = Math.hypot(er, ei);
        expect(Math.abs(r.nodes.out.re[k] - er)).toBeLessThan(1e-9 * m);
        expect(Math.abs(r.nodes.out.im[k] - ei)).toBeLessThan(1e-9 * m);
      }
    }
  });

  it("rejects a source name that is not a source, a non-AC analysis and an empty set list", () => {
    const c = compile(probedSink(0, 0));
    const code = (f: () => unknown) => { try { f(); return "none"; } catch (e) { return isSimError(e) ? `${e.code}:${e.message}` : "other"; } };
    expect(code(() => c.runAcMulti([{ RNOPE: { ac: 1 } }]))).toMatch(/^invalid:.*RNOPE/);
    expect(code(() => c.runAcMulti([{ VPR: { ac: Number.NaN } }]))).toMatch(/^invalid:.*"ac"/);
    expect(code(() => c.runAcMulti([{ VPR: { ac: 1 } }], {}, { kind: "op" }))).toMatch(/^invalid:.*"kind"/);
    expect(code(() => c.runAcMulti([]))).toMatch(/^invalid:/);
  });
});
