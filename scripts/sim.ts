/**
 * `npm run --silent sim -- FILE.json` runs a netlist through the engine (lib/sim/cli);
 * `npm run --silent sim -- --scenario FILE.json --study NAME` runs a scenario study (lib/design/cli).
 */
const argv = process.argv.slice(2);
const mod = argv.includes("--scenario") ? await import("../lib/design/cli") : await import("../lib/sim/cli");
process.exitCode = await mod.main(argv);

export {};
