// Server benchmarks in one run on one server (npm run bench): each figure is a ratio against the
// health route measured the same way, because this machine is noisy. Needs a build (`npm run
// build`); builds one if there is none. Loopback only: the server listens on 127.0.0.1.
import { existsSync } from "node:fs";
import { gzipSync } from "node:zlib";
import path from "node:path";
import { pathToFileURL } from "node:url";
import autocannon from "autocannon";
import SQLite from "better-sqlite3";
import {
  appEnvironment,
  buildApp,
  prepareFreshDatabase,
  ROOT,
  startNext,
  stopProcess,
  waitForOk,
} from "../tests/e2e/support/app-server";

const PORT = 3300;
const BASE = `http://127.0.0.1:${PORT}`;
const JOBS = 50_000;

/** Adds invented jobs straight into the file, in one transaction (the API would take minutes). */
function fillJobs(dbPath: string, count: number) {
  const db = new SQLite(dbPath);
  const customers = db.prepare("select id from customers").all() as { id: number }[];
  const insert = db.prepare(
    `insert into jobs (number, customer_id, engine, status, notes, updated_at, layout, cylinders, promised_date)
     values (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  const states = ["booked", "weighing", "machining", "balancing", "checking", "ready", "collected"];
  const engines = [
    "Cross-plane V8",
    "In-line four",
    "90° V6",
    "Single",
    "Flat-plane V8",
    "In-line six",
  ];
  db.transaction(() => {
    for (let i = 0; i < count; i++) {
      const year = 2010 + (i % 16);
      insert.run(
        `${year}-B${String(i).padStart(6, "0")}`,
        customers[i % customers.length]!.id,
        `${engines[i % engines.length]} bench job ${i}`,
        states[i % states.length],
        null,
        new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString(),
        "inline-4",
        4,
        i % 3 === 0 ? `2026-${String((i % 12) + 1).padStart(2, "0")}-15` : null,
      );
    }
  })();
  db.close();
}

async function signIn(email: string, password: string): Promise<string> {
  const csrfRes = await fetch(`${BASE}/api/auth/csrf`);
  const jar = csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${BASE}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar.join("; ") },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const session = res.headers.getSetCookie().find((c) => c.includes("session-token"));
  if (!session) throw new Error("bench sign-in failed");
  return [...jar, session.split(";")[0]].join("; ");
}

interface Run {
  name: string;
  path: string;
  method?: "GET" | "POST";
  body?: string;
  connections?: number;
}

async function measure(run: Run, cookie: string, seconds: number) {
  const result = await autocannon({
    url: BASE + run.path,
    method: run.method ?? "GET",
    body: run.body,
    headers: { cookie, ...(run.body ? { "content-type": "application/json" } : {}) },
    connections: run.connections ?? 10,
    duration: seconds,
  });
  const bad = result.non2xx + result.errors;
  return {
    name: run.name,
    requestsPerSec: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    bad,
  };
}

const V8_BODY = JSON.stringify({
  layout: { preset: "v8-cross-plane" },
  oilAllowance: "4",
  cylinders: Array.from({ length: 8 }, (_, i) => ({
    number: i + 1,
    piston: String(498 + (i % 3) * 0.4),
    wristPin: "142.3",
    retainers: "2.1",
    rings: "48.2",
    smallEnd: String(184 + (i % 4) * 0.3),
    bigEnd: String(452.5 + (i % 5) * 0.4),
    bearing: "54.1",
  })),
});

/** Compressed size of every script a first visit to the page loads (the weigh-in's budget is 250 kB). */
async function firstLoadJs(pagePath: string, cookie: string) {
  const html = await (await fetch(BASE + pagePath, { headers: { cookie } })).text();
  // Scripts marked nomodule (Next's polyfills) are skipped by every browser that runs modules.
  const tags = [...html.matchAll(/<script[^>]*>/g)]
    .map((m) => m[0])
    .filter((t) => !/nomodule/i.test(t));
  const sources = [
    ...new Set(
      tags.map((t) => /src="([^"]+)"/.exec(t)?.[1]).filter((s): s is string => Boolean(s)),
    ),
  ];
  let gzipped = 0;
  let raw = 0;
  for (const src of sources) {
    const body = Buffer.from(await (await fetch(new URL(src, BASE))).arrayBuffer());
    raw += body.length;
    gzipped += gzipSync(body, { level: 9 }).length;
  }
  return { scripts: sources.length, rawKb: raw / 1024, gzipKb: gzipped / 1024 };
}

export async function runServerBench({ seconds = 5 } = {}) {
  const env = appEnvironment(PORT, "bench", {});
  prepareFreshDatabase(env);
  fillJobs(env.DATABASE_PATH!, JOBS);
  if (!existsSync(path.join(ROOT, ".next", "BUILD_ID"))) buildApp(env);
  const server = startNext(PORT, env);
  try {
    await waitForOk(`${BASE}/api/health`, server);
    const cookie = await signIn("owner@demo.counterpoise.test", "balance-demo-2026");
    const runs: Run[] = [
      { name: "health (baseline)", path: "/api/health" },
      { name: `jobs list, page 1 of ${JOBS}`, path: "/api/jobs?page=1&pageSize=25" },
      { name: "jobs list, page 1000 (offset 24 975)", path: "/api/jobs?page=1000&pageSize=25" },
      { name: "jobs list, search 'bench job 4999'", path: "/api/jobs?search=bench%20job%204999" },
      {
        name: "jobs list, state filter + promised sort",
        path: "/api/jobs?status=ready&sort=promised",
      },
      { name: "job page HTML (/jobs/1)", path: "/jobs/1" },
      { name: "workshop API (V8, weighed)", path: "/api/jobs/1/workshop" },
      {
        name: "POST /api/balance V8, 20 connections",
        path: "/api/balance",
        method: "POST",
        body: V8_BODY,
        connections: 20,
      },
      { name: "health, 20 connections (baseline)", path: "/api/health", connections: 20 },
    ];
    const results = [];
    for (const run of runs) results.push(await measure(run, cookie, seconds));
    const js = await firstLoadJs("/jobs/1/weigh", cookie);
    const base10 = results[0]!.requestsPerSec;
    const base20 = results.at(-1)!.requestsPerSec;
    console.log(`\nServer benchmarks (${seconds} s each, loopback, ${JOBS} jobs in the database)`);
    for (const r of results) {
      const baseline = r.name.includes("20 connections") ? base20 : base10;
      console.log(
        `${r.name.padEnd(46)} ${r.requestsPerSec.toFixed(0).padStart(6)} req/s  p50 ${String(r.p50).padStart(4)} ms  p99 ${String(r.p99).padStart(4)} ms  ratio to health ${(r.requestsPerSec / baseline).toFixed(2)}${r.bad ? `  (${r.bad} non-2xx/errors!)` : ""}`,
      );
    }
    console.log(
      `weigh-in page first-load JavaScript: ${js.scripts} scripts, ${js.gzipKb.toFixed(1)} kB gzip (${js.rawKb.toFixed(0)} kB raw); budget 250 kB, ratio ${(js.gzipKb / 250).toFixed(2)}`,
    );
    return { results, firstLoadJs: js };
  } finally {
    await stopProcess(server);
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  await runServerBench({ seconds: Number(process.env.BENCH_SECONDS ?? 5) });
}
