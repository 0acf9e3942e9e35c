/**
 * `npm run --silent sim -- --scenario FILE.json --study op|loopgain|step|checks|closedloop|zout|dc|noise|sweep|map|spread|compensate`
 * runs a scenario study and prints its result as JSON on stdout (Float64Arrays as plain arrays).
 *
 * Exit codes: 0 done; 2 bad arguments or an invalid scenario (the message names the field); 3 the engine could not
 * solve (no convergence, singular matrix); 4 the time budget ran out. Flags: --budget-ms N (default 30 000),
 * --runs N and --seed N (spread), --pretty.
 */
import { readFileSync } from "node:fs";
import { isSimError } from "../sim";
import { runChecks } from "./checks";
import { runClosedLoop, runDcTransfer, runLoopGain, runOperatingPoint, runOutputImpedance, runSmallSignalStep, runStep } from "./run";
import { ScenarioError } from "./schema";
import { compensate, map2d, spread, sweep1d, worstCaseCorners } from "./studies";
import { upgradeScenario } from "./upgrade";
import { noiseCheck, runNoiseStudy } from "./noise";

export const STUDIES = ["op", "loopgain", "step", "checks", "closedloop", "zout", "dc", "noise", "sweep", "map", "spread", "compensate"] as const;

const USAGE = `usage: npm run --silent sim -- --scenario FILE.json --study ${STUDIES.join("|")} [--budget-ms N] [--runs N] [--seed N] [--pretty]`;

/** Float64Arrays become plain arrays; NaN and ±Infinity become null (JSON has no such numbers). */
function toJson(value: unknown): unknown {
  if (value instanceof Float64Array) return Array.from(value, (x) => (Number.isFinite(x) ? x : null));
  if (Array.isArray(value)) return value.map(toJson);
  if (typeof value === "number") return Number.isFinite(value) ? value : null;
  if (value && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) out[k] = toJson(v);
    return out;
  }
  return value;
}

function flag(argv: string[], name: string): string | undefined {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
}

function intFlag(argv: string[], name: string): number | undefined {
  const v = flag(argv, name);
  if (v === undefined) return undefined;
  const n = Number(v);
  if (!Number.isInteger(n) || n <= 0) throw new ScenarioError(`${name}: expected a positive whole number, got "${v}"`);
  return n;
}

export async function main(argv: string[]): Promise<number> {
  const file = flag(argv, "--scenario");
  const study = flag(argv, "--study") ?? "op";
  if (!file) {
    process.stderr.write(`${USAGE}\n`);
    return 2;
  }
  if (!(STUDIES as readonly string[]).includes(study)) {
    process.stderr.write(`--study: unknown study "${study}"\n${USAGE}\n`);
    return 2;
  }
  try {
    let text: string;
    try {
      text = readFileSync(file, "utf8");
    } catch (e) {
      throw new ScenarioError(`--scenario: cannot read ${file} (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
    }
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      throw new ScenarioError(`${file}: not valid JSON (${(e as Error).message})`);
    }
    const s = upgradeScenario(json);
    const budget = intFlag(argv, "--budget-ms") ?? 30_000;
    const deadline = Date.now() + budget;
    const options = { timeBudgetMs: budget };
    const shouldStop = () => Date.now() > deadline;
    let result: unknown;
    switch (study) {
      case "op": result = runOperatingPoint(s, options); break;
      case "loopgain": result = runLoopGain(s, options); break;
      case "step": {
        const step = runStep(s, options);
        result = { ...step, smallSignal: runSmallSignalStep(s, options, step.metrics.initial) };
        break;
      }
      case "checks": {
        let op;
        try { op = runOperatingPoint(s, options).op; } catch (e) { if (!isSimError(e)) throw e; }
        result = runChecks(s, op);
        break;
      }
      case "closedloop": result = runClosedLoop(s, options); break;
      case "zout": result = runOutputImpedance(s, options); break;
      case "dc": result = runDcTransfer(s, options); break;
      case "noise": {
        const noise = runNoiseStudy(s, options);
        result = { ...noise, check: noiseCheck(noise) };
        break;
      }
      case "sweep": result = sweep1d(s, s.studies.sweep, { shouldStop, timeBudgetMs: budget }); break;
      case "map": result = map2d(s, s.studies.map, { shouldStop, timeBudgetMs: budget }); break;
      case "spread": {
        const runs = intFlag(argv, "--runs") ?? s.studies.spread.runs;
        const seedText = flag(argv, "--seed");
        const seed = seedText === undefined ? s.studies.spread.seed : Number(seedText);
        if (!Number.isInteger(seed)) throw new ScenarioError(`--seed: expected a whole number, got "${seedText}"`);
        result = { ...spread(s, { runs, seed }, { shouldStop, timeBudgetMs: budget }), corners: worstCaseCorners(s, { shouldStop, timeBudgetMs: budget }) };
        break;
      }
      case "compensate": result = compensate(s, s.studies.compensate, { shouldStop, timeBudgetMs: budget }); break;
    }
    const pretty = argv.includes("--pretty");
    process.stdout.write(`${JSON.stringify(toJson({ study, result }), null, pretty ? 2 : undefined)}\n`);
    return 0;
  } catch (e) {
    if (e instanceof ScenarioError) {
      process.stderr.write(`Invalid scenario: ${e.message}\n`);
      return 2;
    }
    if (isSimError(e)) {
      process.stderr.write(`${e.message}\n`);
      if (e.code === "invalid") return 2;
      return e.code === "budget" || e.code === "cancelled" ? 4 : 3;
    }
    throw e;
  }
}
