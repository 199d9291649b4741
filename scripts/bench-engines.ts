// The jobs-list search and one weight save on both engines in one run, each as a ratio to the
// health route's work measured the same way on the same engine (this machine is noisy: the
// ratios are the figures, never a pass/fail). In process, through the same db/ and lib/ calls the
// routes make: SQLite on a file in a temporary folder, PostgreSQL on a throw-away server
// (scripts/test-pg-cluster.ts; skipped with a note when its programs are missing). 50 000
// invented jobs on each. "before" is the search as it was (lower(...) like '%term%' over the
// number, engine and customer's name: a scan of every job); "after" is db/search.ts on the
// engine's full-text index (migration 0190).
// Run: npx tsx scripts/bench-engines.ts (ROUNDS=40 JOBS=50000 to change the counts).
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { type Expression, type SqlBool, sql } from "kysely";

const dir = mkdtempSync(path.join(tmpdir(), "bench-engines-"));
process.env.DATABASE_PATH = path.join(dir, "bench.db");

const { GET: health } = await import("../app/api/health/route");
const client = await import("../db/client");
const { migrateToLatest } = await import("../db/migrate");
const { createCustomer } = await import("../lib/customers/manage");
const { listJobs } = await import("../db/jobs");
const { createJob } = await import("../lib/jobs/save");
const { createUser } = await import("../lib/users/manage");
const { savePartWeight, saveWeighing } = await import("../lib/workshop/save-weight");
const { MissingPostgresError, startThrowawayCluster } = await import("./test-pg-cluster");

type DB = ReturnType<typeof client.openDatabase>;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function time(rounds: number, run: () => Promise<unknown>): Promise<number> {
  await run(); // warm up (prepared statements, caches)
  const times: number[] = [];
  for (let i = 0; i < rounds; i++) {
    const start = performance.now();
    await run();
    times.push(performance.now() - start);
  }
  return median(times);
}

/** The search as it was before the full-text index: every job's text lower-cased and scanned. */
function likeSearch(term: string): Expression<SqlBool> {
  const pattern = `%${term.toLowerCase().replace(/[!%_]/g, (c) => `!${c}`)}%`;
  const columns = ["jobs.number", "jobs.engine", "customers.name"].map(
    (c) => sql<SqlBool>`lower(coalesce(${sql.ref(c)}, '')) like ${pattern} escape '!'`,
  );
  return sql<SqlBool>`(${sql.join(columns, sql` or `)})`;
}

async function searchBefore(db: DB, term: string) {
  const base = db
    .selectFrom("jobs")
    .innerJoin("customers", "customers.id", "jobs.customer_id")
    .where(likeSearch(term));
  return Promise.all([
    base
      .selectAll("jobs")
      .select("customers.name as customer_name")
      .orderBy("jobs.id", "desc")
      .limit(25)
      .execute(),
    base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow(),
  ]);
}

const ENGINES = [
  "Cross-plane V8",
  "In-line four",
  "90° V6",
  "Single",
  "Flat-plane V8",
  "In-line six",
];
const STATES = [
  "booked",
  "weighing",
  "machining",
  "balancing",
  "checking",
  "ready",
  "collected",
] as const;
const SURNAMES = [
  "Smithers",
  "Okafor",
  "Quarrie",
  "Renwick",
  "Talbot",
  "Dubois",
  "Haldane",
  "Marsh",
];

async function fill(db: DB, count: number) {
  const customers: number[] = [];
  for (let i = 0; i < 40; i++) {
    const name = `${["Ada", "Bram", "Cato", "Dee", "Esme"][i % 5]} ${SURNAMES[i % SURNAMES.length]} ${i}`;
    customers.push((await createCustomer(db, { name }, null)).id);
  }
  for (let start = 0; start < count; start += 1000) {
    const rows = [];
    for (let i = start; i < Math.min(count, start + 1000); i++) {
      rows.push({
        number: `${2010 + (i % 16)}-B${String(i).padStart(6, "0")}`,
        customer_id: customers[i % customers.length]!,
        engine: `${ENGINES[i % ENGINES.length]} bench job ${i}`,
        status: STATES[i % STATES.length]!,
        updated_at: new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString(),
        layout: "inline-4",
        cylinders: 4,
      });
    }
    await db.insertInto("jobs").values(rows).execute();
  }
}

/** A V8 matched by cylinder with every part weighed; answers a save of cylinder 1's piston. */
async function weightSaver(db: DB) {
  const customer = await createCustomer(db, { name: "Bench customer" }, null);
  const machinist = await createUser(
    db,
    {
      email: `bench-${Date.now()}@example.test`,
      name: "Bench machinist",
      passwordHash: "x",
      role: "machinist",
    },
    null,
  );
  const job = await createJob(
    db,
    {
      customerId: customer.id,
      engine: "bench V8",
      spec: { layout: "v8-cross-plane", cylinders: 8, matching: "by-cylinder" },
    },
    null,
  );
  const base = { piston: 498, wristPin: 142.3, smallEnd: 184, bigEnd: 452.5 };
  for (const kind of ["piston", "wristPin", "smallEnd", "bigEnd"] as const)
    for (let c = 1; c <= 8; c++)
      await savePartWeight(
        db,
        {
          jobId: job.id,
          cylinder: c,
          kind,
          phase: "initial",
          readings: [(base[kind] + ((c * 3) % 5) * 0.2).toFixed(1)],
          baseVersion: 0,
        },
        null,
      );
  let version = 1;
  return async () => {
    const input = {
      cylinder: 1,
      kind: "piston" as const,
      phase: "initial" as const,
      readings: [version % 2 ? "498.4" : "498.6"],
      version,
    };
    const answer = await saveWeighing(db, job, input, machinist.id);
    version = answer.weight!.version;
  };
}

const SEARCHES = [
  { name: "engine words 'bench job 4999'", term: "bench job 4999" },
  { name: "job number start '2025-B0049'", term: "2025-B0049" },
  { name: "customer name start 'smi'", term: "smi" },
];

async function benchEngine(label: string, db: DB, jobs: number, rounds: number) {
  client.setDb(db);
  await migrateToLatest(db);
  const t0 = performance.now();
  await fill(db, jobs);
  await sql`analyze`.execute(db); // fresh statistics for the planner, on both engines
  console.log(
    `\n${label}: ${jobs} jobs in ${((performance.now() - t0) / 1000).toFixed(1)} s; median of ${rounds} rounds`,
  );
  const h1 = await time(rounds, async () => (await health()).json());
  const lines: [string, number][] = [];
  for (const s of SEARCHES) {
    const after = await listJobs(db, { search: s.term, limit: 25 });
    const before = await searchBefore(db, s.term);
    lines.push([
      `search ${s.name}, before (like scan; ${Number(before[1].n)} found)`,
      await time(rounds, () => searchBefore(db, s.term)),
    ]);
    lines.push([
      `search ${s.name}, after (full-text; ${after.total} found)`,
      await time(rounds, () => listJobs(db, { search: s.term, limit: 25 })),
    ]);
  }
  lines.push([
    "jobs list page 1, no search",
    await time(rounds, () => listJobs(db, { limit: 25 })),
  ]);
  lines.push(["one weight save (V8 by cylinder)", await time(rounds, await weightSaver(db))]);
  const h2 = await time(rounds, async () => (await health()).json());
  const baseline = (h1 + h2) / 2;
  console.log(`${"health (baseline)".padEnd(74)} ${baseline.toFixed(3).padStart(9)} ms  ratio 1.0`);
  for (const [name, ms] of lines)
    console.log(
      `${name.padEnd(74)} ${ms.toFixed(3).padStart(9)} ms  ratio ${(ms / baseline).toFixed(1)}`,
    );
  return { baseline, lines };
}

export async function runEnginesBench(jobs = 50_000, rounds = 40) {
  const sqlite = client.openDatabase(process.env.DATABASE_PATH!);
  try {
    await benchEngine("SQLite", sqlite, jobs, rounds);
  } finally {
    await sqlite.destroy();
  }
  let cluster: Awaited<ReturnType<typeof startThrowawayCluster>> | undefined;
  try {
    cluster = await startThrowawayCluster();
  } catch (error) {
    if (!(error instanceof MissingPostgresError)) throw error;
    console.log(`\nPostgreSQL skipped: ${error.message}`);
    return;
  }
  const pg = client.openPostgres(cluster.url, { max: 4 });
  try {
    await benchEngine("PostgreSQL", pg, jobs, rounds);
  } finally {
    await pg.destroy();
    await cluster.stop();
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  try {
    await runEnginesBench(Number(process.env.JOBS ?? 50_000), Number(process.env.ROUNDS ?? 40));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
