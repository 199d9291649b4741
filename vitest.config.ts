import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: {
    alias: { "@": fileURLToPath(new URL("./", import.meta.url)) },
  },
  test: {
    include: ["tests/**/*.test.ts", "tests/**/*.test.tsx"],
    exclude: ["tests/e2e/**", "node_modules/**"],
    environment: "node",
    // No test reaches the real payment provider: a test that needs one starts our fake and points
    // STRIPE_API_BASE at it; otherwise calls go to a closed loopback port and fail at once.
    env: { STRIPE_API_BASE: "http://127.0.0.1:9" },
    setupFiles: ["tests/helpers/setup.ts"],
    pool: "forks",
    testTimeout: 20_000,
    hookTimeout: 60_000,
  },
});
