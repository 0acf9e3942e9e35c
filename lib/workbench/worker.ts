/**
 * Where the simulation worker comes from. The literal `new Worker(new URL(…), { type: "module" })` lets the
 * bundler (Turbopack) find and bundle the worker module.
 */
export function createSimWorker(): Worker {
  return new Worker(new URL("../../workers/sim.worker.ts", import.meta.url), { type: "module", name: "quell-sim" });
}
