import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    // `import "server-only"` marks modules Next must never bundle for the browser; outside Next the marker throws,
    // so the tests (plain Node, like the server) load its empty variant.
    alias: { "server-only": fileURLToPath(new URL("./node_modules/server-only/empty.js", import.meta.url)) },
  },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    environment: "node",
    // knex loads the .ts migrations with Node's own import(): tsx must be preloaded in the workers.
    execArgv: ["--import", "tsx"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    // Integration tests share one database: run files one at a time.
    fileParallelism: false,
  },
});
