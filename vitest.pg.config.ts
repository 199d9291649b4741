import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// The tests that touch the database, against PostgreSQL: `npm run test:pg` (scripts/test-pg.ts)
// starts a throw-away server; `npx vitest run -c vitest.pg.config.ts <files>` starts one too, or
// uses TEST_DATABASE_URL. Tests of SQLite's own files (backup, its schema) stay out.
export default defineConfig({
  resolve: {
    alias: { "@": fileURLToPath(new URL("./", import.meta.url)) },
  },
  test: {
    include: [
      "tests/db/**/*.test.ts",
      "tests/api/**/*.test.ts",
      "tests/access/**/*.test.ts",
      "tests/payments/**/*.test.ts",
      "tests/app/**/*.test.ts",
    ],
    exclude: ["tests/db/backup.test.ts", "tests/db/sqlite-schema.test.ts", "node_modules/**"],
    environment: "node",
    globalSetup: ["tests/helpers/pg-global-setup.ts"],
    // No test reaches the real payment provider: a test that needs one starts our fake and points
    // STRIPE_API_BASE at it; otherwise calls go to a closed loopback port and fail at once.
    env: { STRIPE_API_BASE: "http://127.0.0.1:9" },
    setupFiles: ["tests/helpers/setup.ts", "tests/helpers/pg-setup.ts"],
    pool: "forks",
    maxWorkers: 2,
    testTimeout: 30_000,
    hookTimeout: 120_000,
  },
});
