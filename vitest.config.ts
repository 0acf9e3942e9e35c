import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { tsconfigPaths: true },
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
