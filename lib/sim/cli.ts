/**
 * Headless engine: `npm run --silent sim -- FILE.json [--budget SECONDS] [--analysis JSON]` prints the result JSON on
 * stdout. `--analysis` replaces the file's analysis, e.g. --analysis '{"kind":"ac","fStart":10,"fStop":1e7}'.
 * Exit codes: 0 ok; 1 usage or unreadable file; 2 invalid netlist; 3 no convergence or singular matrix;
 * 4 time budget exhausted or cancelled.
 */
import { readFileSync } from "node:fs";
import { isSimError, resultToJSON, simulate } from "./index";

const USAGE = "usage: npm run --silent sim -- FILE.json [--budget SECONDS] [--analysis JSON]";

export async function main(argv: string[]): Promise<number> {
  let file: string | null = null;
  let budgetS = 30;
  let analysis: unknown = undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--budget") {
      const v = Number(argv[++i]);
      if (!(v > 0) || !Number.isFinite(v)) { process.stderr.write(`--budget needs a positive number of seconds\n${USAGE}\n`); return 1; }
      budgetS = v;
    } else if (a === "--analysis") {
      try {
        analysis = JSON.parse(argv[++i] ?? "");
      } catch {
        process.stderr.write(`Invalid netlist: --analysis needs a JSON object, e.g. '{"kind":"op"}'\n`);
        return 2;
      }
    } else if (a === "--help" || a === "-h") {
      process.stdout.write(`${USAGE}\n`);
      return 0;
    } else if (file === null) {
      file = a;
    } else {
      process.stderr.write(`unexpected argument "${a}"\n${USAGE}\n`);
      return 1;
    }
  }
  if (file === null) { process.stderr.write(`${USAGE}\n`); return 1; }
  let input: unknown;
  try {
    input = JSON.parse(readFileSync(file, "utf8"));
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    const code = e instanceof SyntaxError ? 2 : 1;
    process.stderr.write(`${code === 2 ? "Invalid netlist: not JSON" : "Cannot read netlist"} (${file}): ${msg}\n`);
    return code;
  }
  if (analysis !== undefined && typeof input === "object" && input !== null) input = { ...input, analysis };
  // a closed pipe (e.g. `| head`) is not an engine error
  process.stdout.once("error", (e: NodeJS.ErrnoException) => { if (e.code !== "EPIPE") throw e; });
  try {
    const result = simulate(input as Parameters<typeof simulate>[0], { timeBudgetMs: budgetS * 1000 });
    process.stdout.write(`${JSON.stringify(resultToJSON(result))}\n`);
    return 0;
  } catch (e) {
    if (isSimError(e)) {
      process.stderr.write(`${e.message}\n`);
      if (e.code === "invalid") return 2;
      if (e.code === "convergence" || e.code === "singular") return 3;
      if (e.code === "budget") { process.stderr.write(`(time budget ${budgetS} s; change it with --budget SECONDS)\n`); return 4; }
      return 4;
    }
    throw e;
  }
}
