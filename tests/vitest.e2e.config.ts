import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const root = fileURLToPath(new URL("..", import.meta.url));

// Browser end-to-end tests: a real built server started by the README's start command, driven by
// Debian's Chromium through playwright-core. One file at a time: each starts its own server.
export default defineConfig({
  root,
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    environment: "node",
    testTimeout: 120_000,
    hookTimeout: 240_000,
    fileParallelism: false,
    pool: "forks",
  },
});
