import { Migrator } from "kysely";
import { describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { migrateToLatest } from "@/db/migrate";
import { takeNextNumber } from "@/lib/billing/numbering";
import { takeNextJobNumber } from "@/lib/jobs/numbering";
import { createJob } from "@/lib/jobs/save";
import { migrations } from "@/migrations";
import { emptyDb, freshDb, testEngine } from "../helpers/db";

const SEEDING = "20261202_0150_seed_job_number_sequences";
const JUNE_2026 = new Date("2026-06-01T12:00:00Z");

/** An empty database brought to the migration just before job numbers moved to the counters. */
async function databaseBeforeSeeding(): Promise<DB> {
  const names = Object.keys(migrations).sort();
  const previous = names[names.indexOf(SEEDING) - 1]!;
  const db = await emptyDb();
  const result = await new Migrator({
    db,
    provider: { getMigrations: async () => migrations },
  }).migrateTo(previous);
  if (result.error) throw result.error;
  return db;
}

async function bookRaw(db: DB, customerId: number, number: string) {
  await db
    .insertInto("jobs")
    .values({ number, customer_id: customerId, engine: "x", updated_at: "2026-01-01T00:00:00Z" })
    .execute();
}

describe(`job numbers (${testEngine()})`, () => {
  it("follow 2026-9999 with 2026-10000 and on, compared as numbers and not as text", async () => {
    const db = await freshDb();
    const customer = await db
      .insertInto("customers")
      .values({ name: "Ada Quist" })
      .returning("id")
      .executeTakeFirstOrThrow();
    await db
      .insertInto("number_sequences")
      .values({ name: "job-2026", last_value: 9998 })
      .execute();
    const numbers = [];
    for (let i = 0; i < 3; i++) {
      numbers.push(
        (await createJob(db, { customerId: customer.id, engine: "x" }, null, JUNE_2026)).number,
      );
    }
    // Padded to four digits, wider past 9999 and never cut: 9998 + 1, + 2, + 3.
    expect(numbers).toEqual(["2026-9999", "2026-10000", "2026-10001"]);
  });

  it("go on from the highest job a shop already booked each year, read as a number", async () => {
    // A shop database from before the counters: as text "2026-9999" sorts after "2026-10000".
    const db = await databaseBeforeSeeding();
    const customer = await db
      .insertInto("customers")
      .values({ name: "Ada Quist" })
      .returning("id")
      .executeTakeFirstOrThrow();
    for (const n of ["2025-0042", "2026-9998", "2026-9999", "2026-10000"]) {
      await bookRaw(db, customer.id, n);
    }
    await migrateToLatest(db);
    const book = async (at: string) =>
      (await createJob(db, { customerId: customer.id, engine: "x" }, null, new Date(at))).number;
    expect(await book("2026-06-01T12:00:00Z")).toBe("2026-10001"); // highest 10000, + 1
    expect(await book("2025-12-31T23:59:59Z")).toBe("2025-0043"); // highest 42, + 1
    expect(await book("2027-01-01T00:00:00Z")).toBe("2027-0001"); // a new year starts at 1
  });

  it("are given back when the booking fails, so the issued numbers have no gap", async () => {
    const db = await freshDb();
    await expect(
      db.transaction().execute(async (trx) => {
        expect(await takeNextJobNumber(trx, JUNE_2026)).toBe("2026-0001");
        throw new Error("the booking failed after taking its number");
      }),
    ).rejects.toThrow(/booking failed/);
    expect(await takeNextJobNumber(db, JUNE_2026)).toBe("2026-0001");
    expect(await takeNextJobNumber(db, JUNE_2026)).toBe("2026-0002");
  });

  it("count separately for jobs, quotes and invoices, and for each year", async () => {
    const db = await freshDb();
    expect(await takeNextJobNumber(db, JUNE_2026)).toBe("2026-0001");
    expect(await takeNextNumber(db, "invoice", JUNE_2026)).toBe("INV-2026-0001");
    expect(await takeNextNumber(db, "quote", JUNE_2026)).toBe("Q-2026-0001");
    expect(await takeNextNumber(db, "invoice", JUNE_2026)).toBe("INV-2026-0002");
    expect(await takeNextNumber(db, "invoice", new Date("2027-01-01T00:00:00Z"))).toBe(
      "INV-2027-0001",
    );
    expect(await takeNextJobNumber(db, JUNE_2026)).toBe("2026-0002");
  });
});
