import { defineConfig } from "vitest/config";
import path from "node:path";

// Pure unit tests only: no database, no services started.
export default defineConfig({
  resolve: { alias: { "~": path.resolve(import.meta.dirname, "app") } },
  test: { include: ["tests/unit/**/*.test.ts"] },
});
