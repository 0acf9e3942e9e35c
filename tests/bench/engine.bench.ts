/**
 * Engine benchmark (`npm run bench -- engine`): the reference sink of our own (tests/unit/lib/sim/fixtures/sink.ts).
 * Cases: op, ac (10 Hz–10 MHz, 50 points/decade), noise (the load current's noise over the same 301 points), tran (2 ms; command step at 0.2 ms, load step at 1 ms) and lu
 * (one bare LU factor + solve of the same matrix). The tran line carries iteration_vs_lu (time per Newton iteration ÷
 * the bare LU) and heap growth over a long run of Newton iterations. One JSON line per case; ≥ 10 runs after warm-up;
 * cpu_ms is the process CPU time per run (mean over the timed runs).
 * ac-budget: a 4 963-element RC grid (41 × 41 nodes) AC run (601 frequencies, several seconds unbounded) under a 3 s
 * budget, through simulate (validation and compilation count against the budget): wall_ms and the overrun.
 */
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { compile, isSimError, simulate, type Analysis, type Netlist } from "@/lib/sim";
import { buildCircuit } from "@/lib/sim/compile";
import { parseNetlist } from "@/lib/sim/netlist";
import { MODE_TRAN } from "@/lib/sim/circuit";
import { loadAll, solveInto, solveDc } from "@/lib/sim/analysis/newton";
import { luFactor, luSolve } from "@/lib/sim/lu";
import { referenceSink } from "../unit/lib/sim/fixtures/sink";

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** CPU ms per run of the last time() call */
let lastCpuMs = 0;

function time(fn: () => void, runs: number, warm = 5): number[] {
  for (let i = 0; i < warm; i++) fn();
  const out: number[] = [];
  const c0 = process.cpuUsage();
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    out.push(performance.now() - t0);
  }
  const cpu = process.cpuUsage(c0);
  lastCpuMs = (cpu.user + cpu.system) / 1000 / runs;
  return out;
}

/** An RC grid of m × m nodes (R between neighbours, C to ground), driven at one corner, loaded at the other. */
function rcGrid(m: number): Netlist {
  const elements: Netlist["elements"] = [{ kind: "vsource", name: "V1", nodes: ["g0_0", "gnd"], dc: 1, ac: 1 }];
  for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) {
    if (i + 1 < m) elements.push({ kind: "resistor", name: `Rv${i}_${j}`, nodes: [`g${i}_${j}`, `g${i + 1}_${j}`], value: 100 });
    if (j + 1 < m) elements.push({ kind: "resistor", name: `Rh${i}_${j}`, nodes: [`g${i}_${j}`, `g${i}_${j + 1}`], value: 100 });
    elements.push({ kind: "capacitor", name: `C${i}_${j}`, nodes: [`g${i}_${j}`, "gnd"], value: 1e-9 });
  }
  elements.push({ kind: "resistor", name: "Rload", nodes: [`g${m - 1}_${m - 1}`, "gnd"], value: 1e3 });
  return { elements, analysis: { kind: "ac", fStart: 10, fStop: 1e7, pointsPerDecade: 100 } };
}

function gcFn(): (() => void) | null {
  try {
    setFlagsFromString("--expose-gc");
    return runInNewContext("gc") as () => void;
  } catch {
    return null;
  }
}

const r3 = (x: number) => Math.round(x * 1000) / 1000;

export async function run(): Promise<void> {
  const RUNS = 40;
  // the machine is shared: min_ms beside each median shows the unloaded cost, load_avg the contention
  const { loadavg } = await import("node:os");
  const load = () => Math.round(loadavg()[0] * 100) / 100;
  const opA: Analysis = { kind: "op" };
  const acA: Analysis = { kind: "ac", fStart: 10, fStop: 1e7, pointsPerDecade: 50 };
  const trA: Analysis = { kind: "tran", tStop: 2e-3 };

  const opT = time(() => simulate(referenceSink(opA)), RUNS);
  const compiledOp = compile(referenceSink(opA));
  const opRunT = time(() => compiledOp.run(), RUNS);
  const opCpu = lastCpuMs;
  console.log(JSON.stringify({ case: "op", median_ms: r3(median(opT)), min_ms: r3(Math.min(...opT)), cpu_ms: r3(opCpu), runs: RUNS, solve_only_median_ms: r3(median(opRunT)), unknowns: compiledOp.unknowns, target_ms: 1, load_avg: load() }));

  const acT = time(() => simulate(referenceSink(acA)), RUNS);
  console.log(JSON.stringify({ case: "ac", median_ms: r3(median(acT)), min_ms: r3(Math.min(...acT)), cpu_ms: r3(lastCpuMs), runs: RUNS, points: 301, target_ms: 5, load_avg: load() }));

  // noise: the load current's noise (the load supply's current) referred to the command, 301 points as the ac case;
  // the op-amp carries noise figures of our own so that every kind of source takes part
  const noiseA: Analysis = { kind: "noise", output: { current: "load-supply" }, input: "command", fStart: 10, fStop: 1e7, pointsPerDecade: 50 };
  const noisy = (): Netlist => {
    const n = referenceSink(noiseA);
    for (const e of n.elements) if (e.kind === "opamp") e.model = { ...e.model, noiseVoltage: 20e-9, noiseVoltageCorner: 100, noiseCurrent: 0.5e-12, noiseCurrentCorner: 200 };
    return n;
  };
  let noisePoints = 0, noiseSources = 0;
  const nzT = time(() => {
    const r = simulate(noisy());
    if (r.kind === "noise") { noisePoints = r.freq.length; noiseSources = Object.keys(r.contributions).length; }
  }, RUNS);
  console.log(JSON.stringify({ case: "noise", median_ms: r3(median(nzT)), min_ms: r3(Math.min(...nzT)), cpu_ms: r3(lastCpuMs), runs: RUNS, points: noisePoints, contributing_elements: noiseSources, target_ms: 10, load_avg: load() }));

  let stats = { accepted: 0, rejected: 0, newtonIterations: 0 };
  const trT = time(() => {
    const r = simulate(referenceSink(trA));
    if (r.kind === "tran") stats = r.stats;
  }, RUNS);
  const trCpu = lastCpuMs;

  // The sink compiled once; its transient-mode Jacobian (companion models stamped, mid-run) is the matrix both the
  // bare LU and the Newton iteration work on, so the ratio compares like with like.
  const c = buildCircuit(parseNetlist(referenceSink({ kind: "op" })));
  c.deadline = Infinity;
  solveDc(c, "bench");
  c.mode = MODE_TRAN;
  c.ag0 = 2 / 1e-6;
  c.trap = 1;
  c.time = 5e-4;
  c.useWaves = true;
  for (const el of c.elements) el.initState(c, false);
  const xs = c.x.slice();
  loadAll(c);
  const base = c.mat.slice();
  const rhs0 = c.rhs.slice();
  const a = new Float64Array(base.length);
  const b = new Float64Array(c.stride);
  const piv = new Int32Array(c.stride);
  const BATCH = 20000;
  // the engine's LU: pivot order and fill pattern from the first factorisation, then numeric-only refactorisation
  const lu = c.lu;
  lu.analyse(base);
  const x = new Float64Array(c.stride);
  a.set(base);
  const P = lu.positions;
  const luOnce = () => {
    for (let k = 0; k < BATCH; k++) {
      for (let q = 0; q < P.length; q++) a[P[q]] = base[P[q]]; // restore only what the factorisation overwrote
      lu.factor(a);
      lu.solve(a, rhs0, x);
    }
  };
  // for comparison: dense LU with partial pivoting on the same matrix
  const denseOnce = () => {
    for (let k = 0; k < BATCH; k++) {
      a.set(base);
      for (let i = 0; i < c.n; i++) b[i] = rhs0[i];
      luFactor(a, c.n, c.stride, piv);
      luSolve(a, c.n, c.stride, piv, b);
    }
  };
  // one Newton iteration = load every element (companion models) + factor + solve (+ the convergence test's cost is
  // one pass over x, not included)
  const iterOnce = () => {
    for (let k = 0; k < BATCH; k++) {
      loadAll(c);
      solveInto(c, c.xNew);
      c.x.set(xs);
    }
  };
  // interleave the two so machine load affects both alike
  const luT: number[] = [];
  const itT: number[] = [];
  const denseT: number[] = [];
  luOnce(); iterOnce(); denseOnce();
  for (let r = 0; r < RUNS; r++) {
    let t0 = performance.now();
    denseOnce();
    denseT.push((performance.now() - t0) / BATCH);
    t0 = performance.now();
    luOnce();
    luT.push((performance.now() - t0) / BATCH);
    t0 = performance.now();
    iterOnce();
    itT.push((performance.now() - t0) / BATCH);
  }
  const luMs = median(luT);
  const itMs = median(itT);

  // heap growth over 200 000 Newton iterations (after a forced GC on both sides when available)
  const gc = gcFn();
  gc?.();
  const h0 = process.memoryUsage().heapUsed;
  for (let k = 0; k < 10; k++) iterOnce();
  gc?.();
  const h1 = process.memoryUsage().heapUsed;

  console.log(JSON.stringify({
    case: "tran", median_ms: r3(median(trT)), min_ms: r3(Math.min(...trT)), cpu_ms: r3(trCpu), runs: RUNS, ...stats,
    iteration_us: r3(itMs * 1000), lu_us: r3(luMs * 1000), iteration_vs_lu: r3(itMs / luMs),
    tran_ms_per_newton_iteration_us: r3((median(trT) / stats.newtonIterations) * 1000),
    newton_heap_growth_bytes: h1 - h0, heap_measured_with_gc: gc !== null, newton_iterations_for_heap: 10 * BATCH,
    target_ms: 20, load_avg: load(),
  }));
  console.log(JSON.stringify({
    case: "lu", median_ms: Math.round(luMs * 1e6) / 1e6, median_us: r3(luMs * 1000), runs: RUNS, batch: BATCH, n: c.n,
    matrix_nonzeros: c.structure.reduce((s, v) => s + v, 0), factor_nonzeros: lu.factorNonZeros,
    dense_partial_pivoting_us: r3(median(denseT) * 1000), load_avg: load(),
  }));

  // a large AC run under a budget: where it stops, against the budget
  const grid = rcGrid(41);
  const budgetMs = 3000;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let outcome = "finished";
  try {
    simulate(grid, { timeBudgetMs: budgetMs });
  } catch (e) {
    if (!isSimError(e)) throw e;
    outcome = e.code;
  }
  const wall = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  console.log(JSON.stringify({
    case: "ac-budget", elements: grid.elements.length, budget_ms: budgetMs, wall_ms: Math.round(wall),
    overrun_ms: Math.round(wall - budgetMs), cpu_ms: Math.round((cpu.user + cpu.system) / 1000), outcome,
    target_wall_ms: 3500, load_avg: load(),
  }));
}
