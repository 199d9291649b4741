import { defineConfig, devices } from "@playwright/test";

// E2E_PORT moves the whole browser-test setup (app, fakes, data folder) so two runs can share a machine.
export const E2E_PORT = Number(process.env.E2E_PORT ?? 3100);
const baseURL = `http://127.0.0.1:${E2E_PORT}`;

// Debian's Chromium, never a downloaded browser (`npx playwright install` is not used here).
const chromiumArgs = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
  "--disable-dev-shm-usage",
];

export default defineConfig({
  testDir: "tests/e2e",
  testMatch: "**/*.spec.ts",
  outputDir: "test-results",
  fullyParallel: false,
  workers: 1, // two cores: the server and one browser
  forbidOnly: !!process.env.CI,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: "list",
  use: {
    baseURL,
    screenshot: "only-on-failure",
    trace: "retain-on-failure",
    launchOptions: { executablePath: "/usr/bin/chromium", args: chromiumArgs },
  },
  projects: [{ name: "chromium", use: { ...devices["Desktop Chrome"] } }],
  webServer: {
    command: "node node_modules/tsx/dist/cli.mjs scripts/e2e-server.ts",
    url: `${baseURL}/api/health`,
    timeout: 240_000,
    reuseExistingServer: false,
    gracefulShutdown: { signal: "SIGTERM", timeout: 15_000 },
    stdout: "pipe",
    stderr: "pipe",
  },
});
