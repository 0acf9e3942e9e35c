import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { mkdtempSync, writeFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { spawnSync } from "node:child_process";
import { main } from "@/lib/sim/cli";

let dir = "";
let out = "";
let err = "";
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), "quell-sim-cli-"));
  out = "";
  err = "";
  vi.spyOn(process.stdout, "write").mockImplementation((s: string | Uint8Array) => { out += String(s); return true; });
  vi.spyOn(process.stderr, "write").mockImplementation((s: string | Uint8Array) => { err += String(s); return true; });
});
afterEach(() => {
  vi.restoreAllMocks();
  rmSync(dir, { recursive: true, force: true });
});

function file(name: string, content: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof content === "string" ? content : JSON.stringify(content));
  return p;
}

const divider = {
  elements: [
    { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 10 },
    { kind: "resistor", name: "R1", nodes: ["in", "mid"], value: 3000 },
    { kind: "resistor", name: "R2", nodes: ["mid", "0"], value: 1000 },
  ],
  analysis: { kind: "op" },
};

describe("headless CLI (lib/sim/cli.ts)", () => {
  it("exit 0 and the result JSON on stdout (voltage divider: 10 V · 1k/4k = 2.5 V, Ohm's law)", async () => {
    expect(await main([file("ok.json", divider)])).toBe(0);
    const r = JSON.parse(out);
    expect(r.kind).toBe("op");
    expect(r.nodes.mid).toBeCloseTo(2.5, 12);
    expect(r.currents.V1).toBeCloseTo(-2.5e-3, 15);
  });
  it("transient and AC results are plain arrays", async () => {
    const tran = { ...divider, elements: [...divider.elements, { kind: "capacitor", name: "C1", nodes: ["mid", "0"], value: 1e-6 }], analysis: { kind: "tran", tStop: 1e-3 } };
    expect(await main([file("t.json", tran)])).toBe(0);
    const r = JSON.parse(out);
    expect(Array.isArray(r.time)).toBe(true);
    expect(r.nodes.mid.length).toBe(r.time.length);
    out = "";
    const ac = { ...tran, analysis: { kind: "ac", fStart: 10, fStop: 1e4, pointsPerDecade: 5 } };
    expect(await main([file("a.json", ac)])).toBe(0);
    expect(JSON.parse(out).freq.length).toBe(16);
  });
  it("exit 2 for an invalid netlist, naming the element and field", async () => {
    const bad = { ...divider, elements: [divider.elements[0], { ...divider.elements[1], value: -1 }, divider.elements[2]] };
    expect(await main([file("bad.json", bad)])).toBe(2);
    expect(err).toContain('"R1"');
    expect(err).toContain('field "value"');
    expect(out).toBe("");
  });
  it("noise: exit 0 with plain arrays (the divider's tap: √(4kT·750 Ω) = 3.52e-9 V/√Hz at 27 °C, Johnson–Nyquist, docs/references.md §8.1); exit 2 naming the field of an invalid spec", async () => {
    const spec = { kind: "noise", output: { node: "mid" }, input: "V1", fStart: 10, fStop: 1e3, pointsPerDecade: 1 };
    expect(await main([file("n.json", divider), "--analysis", JSON.stringify(spec)])).toBe(0);
    const r = JSON.parse(out);
    expect(r.freq).toEqual([10, 100, 1000]);
    // in nV/√Hz, to 1e-6 nV
    expect(r.outputDensity[0] * 1e9).toBeCloseTo(Math.sqrt(4 * 1.380649e-23 * 300.15 * 750) * 1e9, 6);
    expect(Object.keys(r.contributions).sort()).toEqual(["R1", "R2"]);
    out = "";
    expect(await main([file("n.json", divider), "--analysis", JSON.stringify({ ...spec, output: { current: "R1" } })])).toBe(2);
    expect(err).toContain('field "output.current"');
    expect(out).toBe("");
  });
  it("exit 2 for a file that is not JSON", async () => {
    expect(await main([file("x.json", "{ not json")])).toBe(2);
    expect(err).toContain("not JSON");
  });
  it("exit 3 for a singular circuit, naming the node or element", async () => {
    const singular = {
      elements: [
        { kind: "vcvs", name: "E1", nodes: ["o", "0"], control: ["o", "0"], gain: 1 },
        { kind: "resistor", name: "R1", nodes: ["o", "0"], value: 1000 },
      ],
      analysis: { kind: "op" },
    };
    expect(await main([file("s.json", singular)])).toBe(3);
    expect(err).toMatch(/Singular.*(node "o"|vcvs "E1")/);
  });
  it("exit 3 when the operating point cannot be found, naming what was tried", async () => {
    // A tolerance below double precision (reltol 1e-17 < 2.2e-16) can never be met on a nonlinear circuit, so
    // Newton, gmin stepping and source stepping all run out: the path a real non-convergence takes.
    const elements: unknown[] = [
      { kind: "vsource", name: "V1", nodes: ["n0", "0"], dc: 1000 },
      { kind: "resistor", name: "R1", nodes: ["n0", "n1"], value: 1 },
    ];
    for (let i = 1; i <= 30; i++) elements.push({ kind: "diode", name: `D${i}`, nodes: [`n${i}`, i === 30 ? "0" : `n${i + 1}`], model: { Is: 1e-16 } });
    const code = await main([file("c.json", { elements, analysis: { kind: "op" }, options: { maxNewton: 5, reltol: 1e-17, vntol: 1e-30, abstol: 1e-30 } }), "--budget", "20"]);
    expect(code).toBe(3);
    expect(err).toContain("Newton");
    expect(err).toContain("gmin stepping");
    expect(err).toContain("source stepping");
  });
  it("--analysis replaces the file's analysis (the reference sink answers op, dcsweep, ac and tran)", async () => {
    const sink = "lib/sim/examples/reference-sink.json";
    for (const a of [
      { kind: "op" },
      { kind: "dcsweep", source: "command", from: 0, to: 5, points: 6 },
      { kind: "ac", fStart: 10, fStop: 1e7, pointsPerDecade: 5 },
    ]) {
      out = "";
      expect(await main([sink, "--analysis", JSON.stringify(a)])).toBe(0);
      expect(JSON.parse(out).kind).toBe(a.kind);
    }
    out = "";
    expect(await main([sink])).toBe(0);
    const tran = JSON.parse(out);
    expect(tran.kind).toBe("tran");
    expect(tran.time[tran.time.length - 1]).toBe(2e-3);
    expect(await main([sink, "--analysis", "{oops"])).toBe(2);
  });
  it("usage error without a file", async () => {
    expect(await main([])).toBe(1);
    expect(err).toContain("usage");
  });
});

describe("`npm run --silent sim -- FILE.json` (scripts/sim.ts → lib/sim/cli.ts)", () => {
  it("prints the result and exits 0; exits 2 on an invalid netlist", () => {
    const good = file("g.json", divider);
    const r = spawnSync("npm", ["run", "--silent", "sim", "--", good], { encoding: "utf8", cwd: process.cwd() });
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).nodes.mid).toBeCloseTo(2.5, 12);
    const bad = file("b.json", { ...divider, elements: [{ kind: "nonsense", name: "X1" }, ...divider.elements] });
    const r2 = spawnSync("npm", ["run", "--silent", "sim", "--", bad], { encoding: "utf8", cwd: process.cwd() });
    expect(r2.status).toBe(2);
    expect(r2.stderr).toContain('unknown kind "nonsense"');
  }, 30_000);
});
