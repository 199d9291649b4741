// The app as the browser tests see it (Playwright's webServer starts this): a fresh demo shop in
// data/e2e/, a production build (E2E_SKIP_BUILD=1 reuses the last one), local fake services, and
// `next start` on http://127.0.0.1:3100 (or E2E_PORT; the fakes sit at fixed offsets from it). SIGTERM or SIGINT stops everything it started.
import type { ChildProcess } from "node:child_process";
import {
  e2eEnvironment,
  buildApp,
  prepareFreshDatabase,
  startNext,
  startNode,
  stopProcess,
  TSX_CLI,
  waitForOk,
  waitForPort,
} from "../tests/e2e/support/app-server";

const PORT = Number(process.env.E2E_PORT ?? 3100);

/**
 * Local stand-ins for hosted services, started before the app and stopped after it. To add one,
 * give the app its address through `env` and list how to start it and how to tell it is up, e.g.
 *   env:      { SMTP_URL: "smtp://127.0.0.1:2625", FAKE_SMTP_PORT: "2625" }
 *   SERVICES: { name: "mail capture", args: [TSX_CLI, "scripts/fake-smtp.ts"], readyPort: 2625 }
 */
interface LocalService {
  name: string;
  /** Node arguments, run from the project folder with the same environment as the app. */
  args: string[];
  /** Ready once this URL answers 200, or once this port on 127.0.0.1 accepts a connection. */
  readyUrl?: string;
  readyPort?: number;
}

const env = e2eEnvironment(PORT, PORT === 3100 ? "e2e" : `e2e-${PORT}`);
const SMTP_PORT = Number(env.FAKE_SMTP_PORT);
const PAYMENTS_PORT = Number(env.FAKE_PAYMENTS_PORT);
const SERVICES: LocalService[] = [
  { name: "mail capture", args: [TSX_CLI, "scripts/fake-smtp.ts"], readyPort: SMTP_PORT },
  { name: "payments", args: [TSX_CLI, "scripts/fake-payments.ts"], readyPort: PAYMENTS_PORT },
];

const running: { name: string; child: ChildProcess }[] = [];
let stopping = false;

async function stopAll(): Promise<void> {
  // The app first, so nothing calls a service that is already gone; then the services.
  for (const { child } of [...running].reverse()) await stopProcess(child);
}

async function shutDown(code: number): Promise<never> {
  if (!stopping) {
    stopping = true;
    await stopAll();
  }
  process.exit(code);
}

// If this script dies some other way, take no orphan with it.
process.on("exit", () => {
  for (const { child } of running) if (child.exitCode === null) child.kill("SIGKILL");
});
for (const signal of ["SIGTERM", "SIGINT"] as const) process.on(signal, () => void shutDown(0));

try {
  prepareFreshDatabase(env);
  if (process.env.E2E_SKIP_BUILD !== "1") buildApp(env);

  for (const service of SERVICES) {
    console.log(`▸ starting ${service.name}`);
    const child = startNode(service.args, env);
    running.push({ name: service.name, child });
    if (service.readyUrl) await waitForOk(service.readyUrl, child);
    if (service.readyPort) await waitForPort(service.readyPort, child);
  }

  console.log(`▸ serving on http://127.0.0.1:${PORT}`);
  const next = startNext(PORT, env);
  running.push({ name: "next", child: next });
  for (const { name, child } of running) {
    child.on("exit", (code, signal) => {
      if (stopping) return;
      console.error(`${name} stopped (${signal ?? code}); stopping the rest`);
      void shutDown(name === "next" ? (code ?? 1) : 1);
    });
  }
} catch (error) {
  console.error(error instanceof Error ? error.message : error);
  await shutDown(1);
}
