import { readFileSync } from "node:fs";
import { Migrator, sql } from "kysely";
import { describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { migrations } from "@/migrations";

// tests/db/fixtures/sqlite-schema-20261201.sql is what SQLite kept in sqlite_master after the
// first five migrations (20261201_*) as they were written for SQLite alone, dumped before they
// learned PostgreSQL. A shop's existing database was made by those: the same migrations must
// still write exactly that schema, statement for statement, or old and new databases differ.
const FIXTURE = new URL("./fixtures/sqlite-schema-20261201.sql", import.meta.url);

async function dumpFirstMigrations(): Promise<string> {
  const db = openDatabase(":memory:");
  const first = Object.fromEntries(
    Object.entries(migrations).filter(([name]) => name.startsWith("20261201_")),
  );
  const result = await new Migrator({
    db,
    provider: { getMigrations: async () => first },
  }).migrateToLatest();
  if (result.error) throw result.error;
  const { rows } = await sql<{ type: string; name: string; tbl_name: string; sql: string | null }>`
    select type, name, tbl_name, sql from sqlite_master
    where name not like 'kysely_%' order by type, name
  `.execute(db);
  await db.destroy();
  return rows
    .map((r) => `-- ${r.type} ${r.name} on ${r.tbl_name}\n${r.sql ?? "(automatic)"};\n`)
    .join("\n");
}

describe("the SQLite schema of the first migrations", () => {
  it("is the one existing shop databases were made with, byte for byte", async () => {
    const before = readFileSync(FIXTURE, "utf8");
    expect(`${await dumpFirstMigrations()}\n`).toBe(before);
  });

  it("still numbers ids with autoincrement and stamps times as ISO-8601 text", async () => {
    const dump = await dumpFirstMigrations();
    expect(dump).toContain(`"id" integer primary key autoincrement`);
    expect(dump).toContain(`strftime('%Y-%m-%dT%H:%M:%fZ','now')`);
    expect(dump).not.toMatch(/identity|bytea|to_char/);
  });
});
