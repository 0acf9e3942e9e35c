import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

/** End-to-end tests: playwright-core driving Debian's Chromium against the server started by scripts/test.sh. */
export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    // The tests read the database through lib/db/knex, which is marked server-only (the marker throws outside Next).
    alias: { "server-only": fileURLToPath(new URL("./node_modules/server-only/empty.js", import.meta.url)) },
  },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    environment: "node",
    testTimeout: 120_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
