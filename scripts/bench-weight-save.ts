// What one weight save costs, as a ratio to the health route's work measured the same way in
// the same run (this machine is noisy; the ratios are the figures, never a pass/fail). In process,
// on a SQLite file in a temporary folder: a V8 matched by cylinder, every part weighed, the piston
// of cylinder 1 saved again and again (its version followed, as the grid does).
//   before: the check, the write, then the whole bench record (loadWorkshop: rotating records and
//           the plan with its piston-to-rod pairing search), as the weights route answered it
//   after:  saveWeighing as the weights route calls it now (the plan without the pairing search)
// Run: npx tsx scripts/bench-weight-save.ts (ROUNDS=200 to change the count).
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";

const dir = mkdtempSync(path.join(tmpdir(), "bench-weight-save-"));
process.env.DATABASE_PATH = path.join(dir, "bench.db");

const { GET: health } = await import("../app/api/health/route");
const { setDb, openDatabase } = await import("../db/client");
const { migrateToLatest } = await import("../db/migrate");
const { createCustomer } = await import("../lib/customers/manage");
const { createJob } = await import("../lib/jobs/save");
const { createUser } = await import("../lib/users/manage");
const { findOutlierPercent, listPartWeights } = await import("../db/weights");
const { checkPartWeight } = await import("../lib/workshop/outliers");
const { loadWorkshop } = await import("../lib/workshop/load");
const { savePartWeight, saveWeighing } = await import("../lib/workshop/save-weight");

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function time(rounds: number, run: () => Promise<unknown>) {
  const times: number[] = [];
  let bytes = 0;
  for (let i = 0; i < rounds; i++) {
    const start = performance.now();
    const answer = await run();
    bytes = JSON.stringify(answer ?? null).length;
    times.push(performance.now() - start);
  }
  return { ms: median(times), bytes };
}

export async function runWeightSaveBench(rounds = 200) {
  const db = openDatabase(process.env.DATABASE_PATH!);
  setDb(db);
  await migrateToLatest(db);
  const customer = await createCustomer(db, { name: "Bench customer" }, null);
  const machinist = await createUser(
    db,
    { email: "bench@example.test", name: "Bench machinist", passwordHash: "x", role: "machinist" },
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
  const kinds = ["piston", "wristPin", "smallEnd", "bigEnd"] as const;
  const base = { piston: 498, wristPin: 142.3, smallEnd: 184, bigEnd: 452.5 };
  for (const kind of kinds)
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
  const readings = () => [version % 2 ? "498.4" : "498.6"];

  const before = async () => {
    const input = {
      cylinder: 1,
      kind: "piston" as const,
      phase: "initial" as const,
      readings: readings(),
      version,
    };
    const [weights, percent] = await Promise.all([
      listPartWeights(db, job.id),
      findOutlierPercent(db),
    ]);
    checkPartWeight(job, weights, input, percent ?? "5");
    const weight = await savePartWeight(
      db,
      { ...input, jobId: job.id, baseVersion: version, confirmedOutlier: false },
      machinist.id,
    );
    version = weight!.version;
    return { weight, plan: (await loadWorkshop(db, job)).plan };
  };
  const after = async () => {
    const input = {
      cylinder: 1,
      kind: "piston" as const,
      phase: "initial" as const,
      readings: readings(),
      version,
    };
    const answer = await saveWeighing(db, job, input, machinist.id);
    version = answer.weight!.version;
    return answer;
  };

  // Warm up each path once (module caches, prepared statements).
  await health();
  await before();
  await after();
  const h = await time(rounds, async () => (await health()).json());
  const b = await time(rounds, before);
  const a = await time(rounds, after);
  const h2 = await time(rounds, async () => (await health()).json());
  const baseline = (h.ms + h2.ms) / 2;
  console.log(`One weight saved, V8 by cylinder, ${rounds} rounds each (median, in process)`);
  const line = (name: string, r: { ms: number; bytes: number }) =>
    console.log(
      `${name.padEnd(52)} ${r.ms.toFixed(3).padStart(8)} ms  answer ${String(r.bytes).padStart(6)} B  ratio to health ${(r.ms / baseline).toFixed(1)}`,
    );
  line("health (baseline)", { ms: baseline, bytes: h.bytes });
  line("save, before (check + write + whole record, pairing)", b);
  line("save, after (check + write + plan, no pairing search)", a);
  console.log(`after / before: ${(a.ms / b.ms).toFixed(2)}`);
  await db.destroy();
  return { health: baseline, before: b, after: a };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  try {
    await runWeightSaveBench(Number(process.env.ROUNDS ?? 200));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
