import { sql } from "kysely";
import { describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { findMigrationLevel, latestMigration, migrateToEmpty, migrateToLatest } from "@/db/migrate";
import { emptyDb, testEngine } from "../helpers/db";

// On both engines: SQLite in memory by default, PostgreSQL under `npm run test:pg`.
async function tableNames(db: DB) {
  const tables = await db.introspection.getTables();
  return (
    tables
      // SQLite's full-text search tables (migration 0190) are the index, not the shop's data.
      .filter(
        (t) => !t.isView && !t.name.startsWith("sqlite_") && !/^(job|customer)_search/.test(t.name),
      )
      .map((t) => t.name)
      .sort()
  );
}

describe(`migrations (${testEngine()})`, () => {
  it("apply to an empty database and reach the latest level", async () => {
    const db = await emptyDb();
    expect(await findMigrationLevel(db)).toBeNull();
    await migrateToLatest(db);
    expect(await tableNames(db)).toEqual([
      "audit_log",
      "balance_cards",
      "build_cards",
      "build_requests",
      "build_sections",
      "build_settings",
      "counter_settings",
      "customers",
      "ended_sessions",
      "invites",
      "invoice_lines",
      "invoices",
      "jobs",
      "mail_attachments",
      "mail_log",
      "number_sequences",
      "part_targets",
      "part_weights",
      "payment_events",
      "payment_sessions",
      "payments",
      "price_items",
      "quote_lines",
      "quotes",
      "rate_limits",
      "rotating_records",
      "shop_logo",
      "shop_settings",
      "sign_in_failures",
      "unapplied_payments",
      "uploads",
      "users",
    ]);
    expect(await findMigrationLevel(db)).toBe(latestMigration);
  });

  it("roll back to an empty schema", async () => {
    const db = await emptyDb();
    await migrateToLatest(db);
    await migrateToEmpty(db);
    expect(await tableNames(db)).toEqual([]);
    expect(await findMigrationLevel(db)).toBeNull();
  });

  it("turn on foreign keys, so a job cannot point at a missing customer", async () => {
    const db = await emptyDb();
    await migrateToLatest(db);
    await expect(
      db
        .insertInto("jobs")
        .values({ number: "2026-0001", customer_id: 999, engine: "x", updated_at: "now" })
        .execute(),
    ).rejects.toThrow(/FOREIGN KEY|foreign key constraint/);
  });

  it("refuse a role the product does not have", async () => {
    const db = await emptyDb();
    await migrateToLatest(db);
    await expect(
      sql`insert into users (email, name, password_hash, role) values ('a@b.test', 'A', 'x', 'janitor')`.execute(
        db,
      ),
    ).rejects.toThrow(/CHECK|check constraint/);
  });

  it("number ids from 1 and stamp rows with the time as ISO-8601 text, as the app writes it", async () => {
    const db = await emptyDb();
    await migrateToLatest(db);
    const before = new Date();
    const row = await db
      .insertInto("customers")
      .values({ name: "Ada Quist" })
      .returning(["id", "created_at"])
      .executeTakeFirstOrThrow();
    const after = new Date();
    expect(row.id).toBe(1);
    // Date.prototype.toISOString's form (ECMA-262 Date Time String Format, UTC with milliseconds).
    expect(row.created_at).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    const at = new Date(row.created_at).getTime();
    expect(at).toBeGreaterThanOrEqual(before.getTime() - 1000);
    expect(at).toBeLessThanOrEqual(after.getTime() + 1000);
  });

  it("keep the bytes of an issued card as stored, and refuse to change or delete the card", async () => {
    const db = await emptyDb();
    await migrateToLatest(db);
    const customer = await db
      .insertInto("customers")
      .values({ name: "Ada Quist" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const job = await db
      .insertInto("jobs")
      .values({ number: "2026-0001", customer_id: customer.id, engine: "x", updated_at: "now" })
      .returning("id")
      .executeTakeFirstOrThrow();
    // Every byte value, and a NUL, survive the round trip (blob on SQLite, bytea on PostgreSQL).
    const pdf = Buffer.from([0, 255, ...Array.from({ length: 256 }, (_, i) => i), 0]);
    await db
      .insertInto("balance_cards")
      .values({
        job_id: job.id,
        revision: 1,
        page_size: "A4",
        pdf,
        size_bytes: pdf.length,
        sha256: "a".repeat(64),
        data_json: "{}",
        verification_code: "ABCD-EFGH",
        issued_at: "2026-12-01T10:00:00.000Z",
      })
      .execute();
    const stored = await db.selectFrom("balance_cards").select("pdf").executeTakeFirstOrThrow();
    expect(Buffer.from(stored.pdf).equals(pdf)).toBe(true);
    await expect(
      db.updateTable("balance_cards").set({ data_json: '{"changed":true}' }).execute(),
    ).rejects.toThrow(/an issued balance card never changes/);
    await expect(db.deleteFrom("balance_cards").execute()).rejects.toThrow(
      /issued balance cards are kept/,
    );
    // The one change allowed: marking it superseded, once.
    await db
      .updateTable("balance_cards")
      .set({ superseded_at: "2026-12-02T10:00:00.000Z", superseded_by_revision: 2 })
      .execute();
    await expect(
      db.updateTable("balance_cards").set({ superseded_by_revision: 3 }).execute(),
    ).rejects.toThrow(/an issued balance card never changes/);
  });
});
