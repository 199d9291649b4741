// One command for a fresh machine: migrate, seed if empty, build, serve on http://localhost:3000.
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { startFakePayments } from "./fake-payments";
import { startFakeSmtp } from "./fake-smtp";

const root = path.resolve(import.meta.dirname, "..");
const port = process.env.PORT ?? "3000";
// The local stand-ins' ports; move them (and PORT) to run a second demo beside another one.
const smtpPort = Number(process.env.FAKE_SMTP_PORT ?? 2525);
const paymentsPort = Number(process.env.FAKE_PAYMENTS_PORT ?? 4242);
const dataDir = path.join(root, "data");
mkdirSync(dataDir, { recursive: true });

// A demo secret kept in the data folder so sessions survive a restart; production sets its own.
const secretFile = path.join(dataDir, ".demo-secret");
if (!existsSync(secretFile))
  writeFileSync(secretFile, randomBytes(32).toString("hex"), { mode: 0o600 });
// The same for the key server actions are encrypted with (base64 of 32 random bytes).
const actionsKeyFile = path.join(dataDir, ".demo-actions-key");
if (!existsSync(actionsKeyFile))
  writeFileSync(actionsKeyFile, randomBytes(32).toString("base64"), { mode: 0o600 });

// The payment fake signs its notifications with a secret of this install's own, so nobody who can
// reach a demo can sign payment events with a documented default.
const webhookSecretFile = path.join(dataDir, ".demo-webhook-secret");
if (!existsSync(webhookSecretFile))
  writeFileSync(webhookSecretFile, `whsec_${randomBytes(24).toString("hex")}`, { mode: 0o600 });

const env: NodeJS.ProcessEnv = {
  ...process.env,
  DATABASE_PATH: process.env.DATABASE_PATH ?? path.join(dataDir, "counterpoise.db"),
  NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? readFileSync(secretFile, "utf8").trim(),
  NEXT_SERVER_ACTIONS_ENCRYPTION_KEY:
    process.env.NEXT_SERVER_ACTIONS_ENCRYPTION_KEY ?? readFileSync(actionsKeyFile, "utf8").trim(),
  NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? `http://localhost:${port}`,
  // The demo's stand-ins for hosted services, on this machine only.
  SMTP_URL: process.env.SMTP_URL ?? `smtp://127.0.0.1:${smtpPort}`,
  MAIL_CAPTURE_DIR: process.env.MAIL_CAPTURE_DIR ?? path.join(dataDir, "mail"),
  STRIPE_API_BASE: process.env.STRIPE_API_BASE ?? `http://127.0.0.1:${paymentsPort}`,
  // Test keys of the local payment fake; `next start` runs in production mode, which requires them set.
  STRIPE_SECRET_KEY: process.env.STRIPE_SECRET_KEY ?? "sk_test_local",
  STRIPE_WEBHOOK_SECRET:
    process.env.STRIPE_WEBHOOK_SECRET ?? readFileSync(webhookSecretFile, "utf8").trim(),
};

function run(label: string, args: string[]) {
  console.log(`\n▸ ${label}`);
  const result = spawnSync(process.execPath, args, { cwd: root, env, stdio: "inherit" });
  if (result.status !== 0) {
    console.error(`${label} failed`);
    process.exit(result.status ?? 1);
  }
}

const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");
const next = path.join(root, "node_modules/next/dist/bin/next");
// Which database the demo runs on, without the password a DATABASE_URL may carry.
function databaseName(): string {
  if (!env.DATABASE_URL) return `SQLite ${env.DATABASE_PATH}`;
  const url = new URL(env.DATABASE_URL);
  return `PostgreSQL ${url.host}${url.pathname}`;
}
run(`migrating the database (${databaseName()})`, [tsx, "scripts/migrate.ts"]);
run("seeding the demo shop (only if empty)", [tsx, "scripts/seed.ts"]);
if (process.env.SKIP_BUILD !== "1") run("building the app", [next, "build"]);

console.log(
  `\n▸ starting the local mail capture (SMTP 127.0.0.1:${smtpPort}) and payment service (127.0.0.1:${paymentsPort})`,
);
const smtp = await startFakeSmtp({
  port: smtpPort,
  host: "127.0.0.1",
  captureDir: env.MAIL_CAPTURE_DIR!,
});
const payments = await startFakePayments({
  port: paymentsPort,
  webhookUrl: `http://127.0.0.1:${port}/api/payments/webhook`,
  webhookSecret: env.STRIPE_WEBHOOK_SECRET!,
});

console.log(`\n▸ serving on http://localhost:${port} (Ctrl-C stops)`);
const server = spawn(process.execPath, [next, "start", "-p", port, "-H", "127.0.0.1"], {
  cwd: root,
  env,
  stdio: "inherit",
});
for (const signal of ["SIGINT", "SIGTERM"] as const) process.on(signal, () => server.kill(signal));
server.on("exit", (code) => {
  void Promise.allSettled([smtp.stop(), payments.stop()]).then(() => process.exit(code ?? 0));
});
