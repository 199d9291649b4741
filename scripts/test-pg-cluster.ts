// A throw-away PostgreSQL server for the tests: a new cluster in a temporary folder, on a free
// port on 127.0.0.1 with fsync off (nothing here needs to survive a crash), stopped by its PID and
// deleted afterwards. Used by `npm run test:pg` (scripts/test-pg.ts) and by the PostgreSQL vitest
// configuration when no TEST_DATABASE_URL is given.
import { execFileSync } from "node:child_process";
import { chownSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";

export interface Cluster {
  /** postgres://postgres@127.0.0.1:<port>/postgres (trust authentication: no password). */
  url: string;
  pid: number;
  stop(): Promise<void>;
}

export class MissingPostgresError extends Error {}

/** The folder holding initdb and pg_ctl: PG_BIN, else Debian's newest /usr/lib/postgresql/N/bin. */
export function findPostgresBin(): string {
  const candidates: string[] = [];
  if (process.env.PG_BIN) candidates.push(process.env.PG_BIN);
  const debian = "/usr/lib/postgresql";
  if (existsSync(debian)) {
    const versions = readdirSync(debian)
      .filter((v) => /^\d+$/.test(v))
      .sort((a, b) => Number(b) - Number(a));
    candidates.push(...versions.map((v) => path.join(debian, v, "bin")));
  }
  for (const dir of (process.env.PATH ?? "").split(path.delimiter)) if (dir) candidates.push(dir);
  const found = candidates.find(
    (dir) => existsSync(path.join(dir, "initdb")) && existsSync(path.join(dir, "pg_ctl")),
  );
  if (!found) {
    throw new MissingPostgresError(
      "PostgreSQL server programs (initdb, pg_ctl) were not found, so no test server can be " +
        "started. Install them (Debian: apt-get install -y postgresql), or set PG_BIN to the " +
        "folder holding them, or set TEST_DATABASE_URL to a server you run yourself.",
    );
  }
  return found;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() =>
        typeof address === "object" && address ? resolve(address.port) : reject(new Error("port")),
      );
    });
  });
}

function isRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Starts a new, empty cluster. initdb refuses to run as root: as root it runs as `postgres`. */
export async function startThrowawayCluster(): Promise<Cluster> {
  const bin = findPostgresBin();
  const asRoot = process.getuid?.() === 0;
  const dir = mkdtempSync(path.join(tmpdir(), "counterpoise-pg-"));
  const data = path.join(dir, "data");
  const run = (program: string, args: string[]) => {
    const full = path.join(bin, program);
    return asRoot
      ? execFileSync("runuser", ["-u", "postgres", "--", full, ...args], { stdio: "pipe" })
      : execFileSync(full, args, { stdio: "pipe" });
  };
  try {
    if (asRoot) {
      const uid = Number(execFileSync("id", ["-u", "postgres"]).toString().trim());
      const gid = Number(execFileSync("id", ["-g", "postgres"]).toString().trim());
      chownSync(dir, uid, gid);
    }
    // C collation: text sorts byte by byte, as SQLite's default does, so both engines agree.
    run("initdb", ["-D", data, "-A", "trust", "-U", "postgres", "-E", "UTF8", "--locale=C", "-N"]);
    const port = await freePort();
    const options = [
      `-p ${port}`,
      `-k ${dir}`,
      "-c listen_addresses=127.0.0.1",
      "-c fsync=off",
      "-c synchronous_commit=off",
      "-c full_page_writes=off",
      "-c max_connections=100",
    ].join(" ");
    run("pg_ctl", [
      "-D",
      data,
      "-l",
      path.join(dir, "server.log"),
      "-w",
      "-t",
      "60",
      "-o",
      options,
      "start",
    ]);
    const pid = Number(readFileSync(path.join(data, "postmaster.pid"), "utf8").split("\n")[0]);
    let stopped = false;
    return {
      url: `postgres://postgres@127.0.0.1:${port}/postgres`,
      pid,
      async stop() {
        if (stopped) return;
        stopped = true;
        // SIGINT is PostgreSQL's "fast" shutdown: open sessions are ended, then it exits.
        if (isRunning(pid)) process.kill(pid, "SIGINT");
        const deadline = Date.now() + 30_000;
        while (isRunning(pid) && Date.now() < deadline)
          await new Promise((r) => setTimeout(r, 100));
        if (isRunning(pid)) process.kill(pid, "SIGKILL");
        rmSync(dir, { recursive: true, force: true });
      },
    };
  } catch (error) {
    const pidFile = path.join(data, "postmaster.pid");
    if (existsSync(pidFile)) {
      const pid = Number(readFileSync(pidFile, "utf8").split("\n")[0]);
      if (pid > 0 && isRunning(pid)) process.kill(pid, "SIGKILL");
    }
    const log = path.join(dir, "server.log");
    const detail = existsSync(log) ? `\n${readFileSync(log, "utf8").slice(-2000)}` : "";
    const stderr = (error as { stderr?: Buffer }).stderr?.toString() ?? "";
    rmSync(dir, { recursive: true, force: true });
    throw new Error(
      `Could not start a PostgreSQL test server: ${stderr || String(error)}${detail}`,
    );
  }
}
