import { defineConfig } from "vitest/config";
import path from "node:path";

// Unit and integration tests run without the React Router plugin; "~" maps to app/ as in tsconfig.
export default defineConfig({
  resolve: { alias: { "~": path.resolve(import.meta.dirname, "app") } },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts", "tests/e2e/**/*.test.ts"],
    globalSetup: ["tests/setup/global.ts"],
    testTimeout: 30000,
    hookTimeout: 60000,
    fileParallelism: false,
    pool: "forks",
  },
});
