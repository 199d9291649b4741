import { sql } from "kysely";
import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { listCustomers } from "@/db/customers";
import { createCustomer, updateCustomer } from "@/lib/customers/manage";
import { listJobs } from "@/db/jobs";
import { createJob, updateJob } from "@/lib/jobs/save";
import { jobSearch, searchWords } from "@/db/search";
import { freshDb, testEngine } from "../helpers/db";

// On both engines (SQLite in memory; PostgreSQL under `npm run test:pg`): the job and customer
// searches answer from the full-text indexes of migration 0190, matching the start of each word
// the counter types, as a counter types it.

let db: DB;
const numbers = async (search: string) =>
  (await listJobs(db, { search, sort: "oldest" })).jobs.map((j) => j.engine);

beforeEach(async () => {
  db = await freshDb();
  const smith = await createCustomer(db, { name: "Ada Smithers", phone: "555-0142" }, null);
  const okafor = await createCustomer(
    db,
    { name: "Bram Okafor", company: "Okafor Marine", email: "bram@okafor-marine.test" },
    null,
  );
  const march = new Date(Date.UTC(2026, 2, 10));
  await createJob(db, { customerId: smith.id, engine: "Cross-plane V8 350" }, null, march);
  await createJob(db, { customerId: okafor.id, engine: "In-line six diesel" }, null, march);
  await createJob(db, { customerId: smith.id, engine: "Flat-plane V8" }, null, march);
});

describe(`job search (${testEngine()})`, () => {
  it("cuts what is typed into words and pieces", () => {
    expect(searchWords(" 2026-00  Smi ")).toEqual([["2026", "00"], ["smi"]]);
    expect(searchWords("- / ")).toEqual([]);
  });

  it("finds a job number by the start a counter types, punctuation included", async () => {
    const all = await listJobs(db, { sort: "oldest" });
    const first = all.jobs[0]!.number;
    // The job number is the year, a dash and a serial (db/number-sequences.ts).
    expect(first).toMatch(/^\d{4}-\d+$/);
    const [year, serial] = first.split("-") as [string, string];
    expect(await numbers(`${year}-${serial.slice(0, -1)}`)).toHaveLength(3);
    expect(await numbers(first)).toEqual(["Cross-plane V8 350"]);
    expect(await numbers(`${Number(year) + 1}-`)).toEqual([]);
  });

  it("finds jobs by the start of the customer's name and by engine words, every word", async () => {
    expect(await numbers("smi")).toEqual(["Cross-plane V8 350", "Flat-plane V8"]);
    expect(await numbers("SMI flat")).toEqual(["Flat-plane V8"]);
    expect(await numbers("v8")).toEqual(["Cross-plane V8 350", "Flat-plane V8"]);
    expect(await numbers("cross-pl")).toEqual(["Cross-plane V8 350"]);
    expect(await numbers("dies okaf")).toEqual(["In-line six diesel"]);
    // A prefix search, not a substring one: "mith" starts no word.
    expect(await numbers("mith")).toEqual([]);
    expect((await listJobs(db, { search: "smi" })).total).toBe(2);
  });

  it("keeps the index in step with renamed customers, changed engines and new jobs", async () => {
    const ada = (await listCustomers(db, { search: "ada" })).customers[0]!;
    await updateCustomer(db, ada.id, { name: "Ada Quarrie", phone: "555-0142" }, null);
    expect(await numbers("smi")).toEqual([]);
    expect(await numbers("quarr")).toHaveLength(2);
    const job = (await listJobs(db, { search: "diesel" })).jobs[0]!;
    await updateJob(db, job.id, job.version, { engine: "In-line four petrol" }, null);
    expect(await numbers("diesel")).toEqual([]);
    expect(await numbers("petr")).toEqual(["In-line four petrol"]);
  });

  it("answers from the full-text index, not a scan of every job", async () => {
    const where = jobSearch(db, "2026-00 smi")!;
    const query = db.selectFrom("jobs").select("jobs.id").where(where).compile();
    const text =
      testEngine() === "sqlite"
        ? (
            await db.executeQuery<{ detail: string }>({
              ...query,
              sql: `explain query plan ${query.sql}`,
            })
          ).rows
            .map((r) => r.detail)
            .join("\n")
        : await db.transaction().execute(async (trx) => {
            await sql`set local enable_seqscan = off`.execute(trx);
            const rows = await trx.executeQuery<{ "QUERY PLAN": string }>({
              ...query,
              sql: `explain ${query.sql}`,
            });
            return rows.rows.map((r) => r["QUERY PLAN"]).join("\n");
          });
    if (testEngine() === "sqlite") expect(text).toMatch(/VIRTUAL TABLE INDEX/);
    else {
      expect(text).toMatch(/Bitmap Index Scan on jobs_search/);
      expect(text).toMatch(/Bitmap Index Scan on customers_name_search/);
    }
  });
});

describe(`customer search (${testEngine()})`, () => {
  const names = async (search: string) =>
    (await listCustomers(db, { search })).customers.map((c) => c.name);

  it("finds customers by the start of a name, company, e-mail or phone", async () => {
    expect(await names("smi")).toEqual(["Ada Smithers"]);
    expect(await names("okafor mar")).toEqual(["Bram Okafor"]);
    expect(await names("bram@okafor")).toEqual(["Bram Okafor"]);
    expect(await names("555-01")).toEqual(["Ada Smithers"]);
    expect(await names("555-02")).toEqual([]);
    expect(await names("ithers")).toEqual([]);
  });

  it("finds a new or renamed customer and forgets the old name", async () => {
    await createCustomer(db, { name: "Céline Dubois" }, null);
    expect(await names("CÉLI")).toEqual(["Céline Dubois"]);
    const ada = (await listCustomers(db, { search: "ada" })).customers[0]!;
    await updateCustomer(db, ada.id, { name: "Ada Quarrie" }, null);
    expect(await names("smithers")).toEqual([]);
    expect(await names("quar")).toEqual(["Ada Quarrie"]);
  });
});
