// `npm run test:pg`: the database, API, access, payment and concurrency tests against a real
// PostgreSQL. Starts a throw-away server (scripts/test-pg-cluster.ts), runs vitest with
// vitest.pg.config.ts pointed at it, and stops and deletes the server afterwards, whatever
// happened. Extra arguments go to vitest (`npm run test:pg -- tests/db`). With TEST_DATABASE_URL
// set, that server is used instead and nothing is started.
import { spawn } from "node:child_process";
import { type Cluster, MissingPostgresError, startThrowawayCluster } from "./test-pg-cluster";

let cluster: Cluster | undefined;
let url = process.env.TEST_DATABASE_URL;
if (!url) {
  try {
    cluster = await startThrowawayCluster();
  } catch (error) {
    console.error(error instanceof MissingPostgresError ? error.message : error);
    process.exit(1);
  }
  url = cluster.url;
  console.log(`PostgreSQL test server on ${url} (PID ${cluster.pid})`);
}

const vitest = spawn(
  process.execPath,
  [
    "node_modules/vitest/vitest.mjs",
    "run",
    "--config",
    "vitest.pg.config.ts",
    ...process.argv.slice(2),
  ],
  { stdio: "inherit", env: { ...process.env, TEST_DATABASE_URL: url } },
);
const forward = (signal: NodeJS.Signals) => vitest.kill(signal);
process.on("SIGINT", forward);
process.on("SIGTERM", forward);

const code = await new Promise<number>((resolve) =>
  vitest.on("exit", (exitCode, signal) => resolve(exitCode ?? (signal ? 1 : 0))),
);
await cluster?.stop();
process.exit(code);
