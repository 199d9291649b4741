import { sql } from "kysely";
import { describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { findMigrationLevel, latestMigration, migrateToEmpty, migrateToLatest } from "@/db/migrate";

async function tableNames(db: ReturnType<typeof openDatabase>) {
  const { rows } = await sql<{ name: string }>`
    select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like 'kysely_%' order by name
  `.execute(db);
  return rows.map((r) => r.name);
}

describe("migrations", () => {
  it("apply to an empty database and reach the latest level", async () => {
    const db = openDatabase(":memory:");
    expect(await findMigrationLevel(db)).toBeNull();
    await migrateToLatest(db);
    expect(await tableNames(db)).toEqual([
      "audit_log",
      "balance_cards",
      "customers",
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
      "rotating_records",
      "shop_logo",
      "shop_settings",
      "sign_in_failures",
      "uploads",
      "users",
    ]);
    expect(await findMigrationLevel(db)).toBe(latestMigration);
  });

  it("roll back to an empty schema", async () => {
    const db = openDatabase(":memory:");
    await migrateToLatest(db);
    await migrateToEmpty(db);
    expect(await tableNames(db)).toEqual([]);
    expect(await findMigrationLevel(db)).toBeNull();
  });

  it("turn on foreign keys, so a job cannot point at a missing customer", async () => {
    const db = openDatabase(":memory:");
    await migrateToLatest(db);
    await expect(
      db
        .insertInto("jobs")
        .values({ number: "2026-0001", customer_id: 999, engine: "x", updated_at: "now" })
        .execute(),
    ).rejects.toThrow(/FOREIGN KEY/);
  });

  it("refuse a role the product does not have", async () => {
    const db = openDatabase(":memory:");
    await migrateToLatest(db);
    await expect(
      sql`insert into users (email, name, password_hash, role) values ('a@b.test', 'A', 'x', 'janitor')`.execute(
        db,
      ),
    ).rejects.toThrow(/CHECK/);
  });
});
