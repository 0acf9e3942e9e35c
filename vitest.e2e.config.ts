import { defineConfig } from "vitest/config";

/** End-to-end tests: playwright-core driving Debian's Chromium against the server started by scripts/test.sh. */
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    environment: "node",
    testTimeout: 120_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
