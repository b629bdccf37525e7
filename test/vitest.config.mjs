import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("..", import.meta.url));

export default defineConfig({
  root,
  test: {
    include: ["test/**/*.test.ts"],
    setupFiles: ["test/isolated-env.ts"],
    reporters: ["default", "./test/closing-line-reporter.mjs"],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
  },
});
