// Starting and stopping the built app for browser tests: used by scripts/e2e-server.ts and by
// specs that need a server of their own (crash-safety.spec.ts).
import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { mkdirSync, rmSync } from "node:fs";
import { createConnection } from "node:net";
import path from "node:path";

export const ROOT = path.resolve(import.meta.dirname, "../../..");
/** Runs a TypeScript script with node: `startNode([TSX_CLI, "scripts/x.ts"], env)`. */
export const TSX_CLI = path.join(ROOT, "node_modules/tsx/dist/cli.mjs");
const NEXT = path.join(ROOT, "node_modules/next/dist/bin/next");

/** Signs test sessions only; a real deployment sets its own NEXTAUTH_SECRET. */
export const TEST_AUTH_SECRET = "counterpoise-browser-tests-only-0123456789";
/** Encrypts server actions in tests only (base64 of 32 bytes); production sets its own. */
export const TEST_ACTIONS_KEY = Buffer.from("counterpoise-browser-tests-only!").toString("base64");

/**
 * The environment for an app served on 127.0.0.1:`port` with everything it writes in
 * `data/<folder>/`. Extra keys (a local fake service's address) are laid over it.
 */
export function appEnvironment(
  port: number,
  folder: string,
  extra: Record<string, string> = {},
): NodeJS.ProcessEnv {
  const dataDir = path.join(ROOT, "data", folder);
  const env: Record<string, string | undefined> = {
    ...process.env,
    DATABASE_PATH: path.join(dataDir, "counterpoise.db"),
    UPLOADS_DIR: path.join(dataDir, "uploads"),
    MAIL_CAPTURE_DIR: path.join(dataDir, "mail"),
    NEXTAUTH_SECRET: TEST_AUTH_SECRET,
    NEXT_SERVER_ACTIONS_ENCRYPTION_KEY: TEST_ACTIONS_KEY,
    NEXTAUTH_URL: `http://127.0.0.1:${port}`,
    NEXT_TELEMETRY_DISABLED: "1",
    ...extra,
  };
  // `next build` and `next start` choose production themselves; a leftover "test" confuses them.
  delete env.NODE_ENV;
  return env as NodeJS.ProcessEnv;
}

/**
 * The browser-test environment for an app on `port` that uses the local stand-ins of the main
 * e2e server on `mainPort` (scripts/e2e-server.ts starts them): mail capture and payments.
 */
export function e2eEnvironment(port: number, folder: string, mainPort = port): NodeJS.ProcessEnv {
  const smtpPort = mainPort - 475;
  const paymentsPort = mainPort + 1242;
  return appEnvironment(port, folder, {
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    FAKE_SMTP_PORT: String(smtpPort),
    STRIPE_API_BASE: `http://127.0.0.1:${paymentsPort}`,
    FAKE_PAYMENTS_PORT: String(paymentsPort),
    STRIPE_SECRET_KEY: "sk_test_local",
    STRIPE_WEBHOOK_SECRET: "whsec_local",
    FAKE_PAYMENTS_WEBHOOK_URL: `http://127.0.0.1:${mainPort}/api/payments/webhook`,
    // Every browser test signs in from 127.0.0.1, so the per-address sign-in limits would trip on
    // the suite's own wrong-password cases; they are tested in process (tests/lib/auth/sign-in.test.ts,
    // tests/security/rate-limits.test.ts). The per-e-mail limits keep their defaults here.
    SIGN_IN_MAX_FAILURES_PER_ADDRESS: "100000",
    RATE_LIMIT_SIGN_IN_PER_MINUTE: "100000",
  });
}

/** Deletes and recreates the data folder, then migrates and seeds the demo shop into it. */
export function prepareFreshDatabase(env: NodeJS.ProcessEnv): void {
  const dataDir = path.dirname(env.DATABASE_PATH!);
  const inside = path.relative(path.join(ROOT, "data"), dataDir);
  if (!inside || inside.startsWith("..") || path.isAbsolute(inside))
    throw new Error(`refusing to empty ${dataDir}: test data lives in a folder under data/`);
  rmSync(dataDir, { recursive: true, force: true });
  mkdirSync(dataDir, { recursive: true });
  runStep("migrating", [TSX_CLI, "scripts/migrate.ts"], env);
  runStep("seeding the demo shop", [TSX_CLI, "scripts/seed.ts"], env);
}

export function buildApp(env: NodeJS.ProcessEnv): void {
  runStep("building the app", [NEXT, "build"], env);
}

function runStep(label: string, args: string[], env: NodeJS.ProcessEnv): void {
  console.log(`▸ ${label}`);
  const result = spawnSync(process.execPath, args, { cwd: ROOT, env, stdio: "inherit" });
  if (result.status !== 0) throw new Error(`${label} failed (exit ${result.status})`);
}

/** `next start` as a single node process, so its PID is the whole server. */
export function startNext(
  port: number,
  env: NodeJS.ProcessEnv,
  stdio: "inherit" | "ignore" = "inherit",
): ChildProcess {
  return spawn(process.execPath, [NEXT, "start", "-p", String(port), "-H", "127.0.0.1"], {
    cwd: ROOT,
    env,
    stdio,
  });
}

/** A helper process (a local fake service) run with node from the project folder. */
export function startNode(args: string[], env: NodeJS.ProcessEnv): ChildProcess {
  return spawn(process.execPath, args, { cwd: ROOT, env, stdio: "inherit" });
}

/** Polls `url` until it answers 200, the process exits, or the time runs out. */
export async function waitForOk(url: string, child: ChildProcess, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null)
      throw new Error(`the server stopped before ${url} answered`);
    const ok = await fetch(url).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) return;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs} ms`);
}

/** Waits until 127.0.0.1:`port` accepts a TCP connection (a mail or payment fake is up). */
export async function waitForPort(port: number, child: ChildProcess, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null)
      throw new Error(`the service stopped before port ${port} opened`);
    const open = await new Promise<boolean>((resolve) => {
      const socket = createConnection({ host: "127.0.0.1", port }, () => {
        socket.end();
        resolve(true);
      });
      socket.once("error", () => resolve(false));
    });
    if (open) return;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`port ${port} did not open within ${timeoutMs} ms`);
}

/** Sends `signal`, waits for the exit, and kills outright if it takes longer than `graceMs`. */
export async function stopProcess(
  child: ChildProcess,
  signal: NodeJS.Signals = "SIGTERM",
  graceMs = 10_000,
): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  child.kill(signal);
  const timer = setTimeout(() => child.kill("SIGKILL"), graceMs);
  await exited;
  clearTimeout(timer);
}
