/**
 * Design-layer benchmark: `npm run bench -- design`. One JSON line per case, each with wall_ms and runs_per_s:
 *  - grid16: a 16 × 16 Map (compensation capacitor × cable length, overshoot from a transient each) of the
 *    reference sink, split over two worker_threads;
 *  - montecarlo1000: a 1000-run Spread (operating point + loop gain each), split over two worker_threads;
 *  - autocomp: Compensate on the reference sink, one thread.
 * Targets on the 2-core machine (issue): grid ≤ 4 s, Monte Carlo ≤ 3 s, auto-compensation ≤ 2 s.
 * The three run on a fixed workload, `benchSink()` (the reference sink the targets were set on), so the figures stay
 * comparable when a template's starting point changes; the same three on today's NPN template follow as
 * `*_template` lines.
 * This file is also the worker's entry: started as a worker it runs the chunk it is given and posts the result.
 */
import { Worker, isMainThread, parentPort, workerData } from "node:worker_threads";
import { compensate, defaultScenario, map2d, opampPreset, passPreset, spread, type Scenario } from "../../lib/design";

type Workload = "reference" | "template";
type Job =
  | { role: "design-bench"; workload: Workload; kind: "grid"; start: number; end: number }
  | { role: "design-bench"; workload: Workload; kind: "spread"; start: number; end: number; runs: number; seed: number };

/**
 * The benchmark's fixed workload: a 1.04 A sink (5 V × 1k/48k across 0.1 Ω) with a general-purpose 1 MHz op-amp and
 * a β ≥ 30 medium-power NPN driving a 24 Ω + 5 mH coil over 2 m of cable on 30 V, a 10 ms record — the NPN
 * template's starting point until the templates became sound designs, stepping from zero (it fails two checks; as a
 * workload it is fine).
 */
export function benchSink(): Scenario {
  const s = defaultScenario("sink-npn");
  s.opamp = opampPreset("General 1 MHz single-supply");
  s.pass = passPreset("Medium power NPN 60 V");
  s.parts = { ...s.parts, dividerTop: 47e3, dividerBottom: 1e3, senseResistor: 0.1 };
  s.supplies = { ...s.supplies, load: 30 };
  s.stimulus = { ...s.stimulus, commandLow: 0, stopTime: 10e-3 };
  s.tolerances = { ...s.tolerances, resistor: 0.01, resistorTempco: 100e-6 };
  return s;
}

const scenarioFor = (w: Workload): Scenario => (w === "reference" ? benchSink() : defaultScenario("sink-npn"));

function gridSettings(s: Scenario) {
  return {
    x: { path: "parts.compCapacitor", from: 100e-12, to: 22e-9, points: 16, scale: "log" as const, values: [] },
    y: { path: "load.cable.length", from: 0.5, to: 20, points: 16, scale: "log" as const, values: [] },
    metric: "overshootPct" as const,
  };
}

function runJob(job: Job): { computed: number; failures: number } {
  const s = scenarioFor(job.workload);
  if (job.kind === "grid") {
    const g = gridSettings(s);
    const r = map2d(s, g, {}, { start: job.start, end: job.end });
    return { computed: job.end - job.start, failures: r.failures.length };
  }
  const r = spread(s, { runs: job.runs, seed: job.seed }, {}, { start: job.start, end: job.end });
  return { computed: job.end - job.start, failures: r.failures.length };
}

if (!isMainThread && (workerData as Job | undefined)?.role === "design-bench") {
  // Warm-up: a couple of runs so the JIT has compiled the engine before the clock matters to the parent.
  const job = workerData as Job;
  runJob(job.kind === "grid" ? { ...job, start: 0, end: 2 } : { ...job, start: 0, end: 3 });
  parentPort!.postMessage({ ready: true });
  parentPort!.once("message", () => {
    parentPort!.postMessage(runJob(job));
  });
}

function startWorker(job: Job): { ready: Promise<void>; go: () => Promise<{ computed: number; failures: number }>; worker: Worker } {
  // A worker does not inherit the tsx loader: a small bootstrap registers it, then imports this file.
  const bootstrap = `import("tsx/esm/api").then(({ register }) => { register(); return import(${JSON.stringify(import.meta.url)}); });`;
  const worker = new Worker(bootstrap, { eval: true, workerData: job });
  let resolveReady!: () => void;
  const ready = new Promise<void>((r) => { resolveReady = r; });
  let resolveDone!: (v: { computed: number; failures: number }) => void;
  let rejectDone!: (e: unknown) => void;
  const done = new Promise<{ computed: number; failures: number }>((res, rej) => { resolveDone = res; rejectDone = rej; });
  worker.on("message", (m: { ready?: boolean; computed?: number; failures?: number }) => {
    if (m.ready) resolveReady();
    else resolveDone(m as { computed: number; failures: number });
  });
  worker.on("error", (e) => rejectDone(e));
  return { ready, worker, go: () => { worker.postMessage("go"); return done; } };
}

/** Wall time, and CPU time of the whole process (all threads): the CPU figure shows the cost when other work shares the cores. */
async function twoThreads(jobs: [Job, Job]): Promise<{ wallMs: number; cpuMs: number; runs: number; failures: number }> {
  const ws = jobs.map(startWorker);
  await Promise.all(ws.map((w) => w.ready));
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const res = await Promise.all(ws.map((w) => w.go()));
  const wallMs = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  await Promise.all(ws.map((w) => w.worker.terminate()));
  return {
    wallMs,
    cpuMs: (cpu.user + cpu.system) / 1000,
    runs: res.reduce((a, r) => a + r.computed, 0),
    failures: res.reduce((a, r) => a + r.failures, 0),
  };
}

function line(obj: Record<string, unknown>): void {
  process.stdout.write(`${JSON.stringify(obj)}\n`);
}

export async function run(): Promise<void> {
  for (const workload of ["reference", "template"] as const) await runWorkload(workload);
}

async function runWorkload(workload: Workload): Promise<void> {
  const suffix = workload === "reference" ? "" : "_template";
  // Each worker warms up on a tiny job of its own before it reports ready; the clock starts after that.
  const grid = await twoThreads([
    { role: "design-bench", workload, kind: "grid", start: 0, end: 128 },
    { role: "design-bench", workload, kind: "grid", start: 128, end: 256 },
  ]);
  const load = (await import("node:os")).loadavg()[0];
  line({ case: `grid16${suffix}`, wall_ms: Math.round(grid.wallMs), runs: grid.runs, runs_per_s: +(grid.runs / (grid.wallMs / 1000)).toFixed(1), cpu_ms: Math.round(grid.cpuMs), threads: 2, failures: grid.failures, target_ms: 4000, load1: +load.toFixed(1) });

  const mc = await twoThreads([
    { role: "design-bench", workload, kind: "spread", start: 0, end: 500, runs: 1000, seed: 1 },
    { role: "design-bench", workload, kind: "spread", start: 500, end: 1000, runs: 1000, seed: 1 },
  ]);
  line({ case: `montecarlo1000${suffix}`, wall_ms: Math.round(mc.wallMs), runs: mc.runs, runs_per_s: +(mc.runs / (mc.wallMs / 1000)).toFixed(1), cpu_ms: Math.round(mc.cpuMs), threads: 2, failures: mc.failures, target_ms: 3000 });

  const s = scenarioFor(workload);
  compensate(s, { ...s.studies.compensate, series: "E6" }); // warm-up
  let stepped = 0, scanned = 0;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = compensate(s, s.studies.compensate);
  const wall = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  stepped = r.stepped.length;
  scanned = r.scanned.length;
  const runs = scanned + stepped;
  line({ case: `autocomp${suffix}`, wall_ms: Math.round(wall), runs, runs_per_s: +(runs / (wall / 1000)).toFixed(1), cpu_ms: Math.round((cpu.user + cpu.system) / 1000), threads: 1, chosen_F: r.chosen?.compCapacitor ?? null, target_ms: 2000 });
}
