/**
 * `npm run bench`: runs every tests/bench/*.bench.ts in turn (or only those named on the command line).
 * Each bench module exports `run(): Promise<void>` and prints one JSON line per case.
 */
import { readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith(".bench.ts"))
  .filter((f) => only.length === 0 || only.some((o) => f.startsWith(o)))
  .sort();
for (const f of files) {
  const mod = (await import(pathToFileURL(join(here, f)).href)) as { run: () => Promise<void> };
  await mod.run();
}
