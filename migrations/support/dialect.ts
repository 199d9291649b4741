import { type ColumnDefinitionBuilder, type Kysely, type RawBuilder, sql } from "kysely";

// What the migrations write differently on SQLite and on PostgreSQL. Migrations already applied
// to a shop's database depend on these: never change what a helper produces; add a new one.
// (This folder holds no migration: the file provider skips anything without an `up`.)

/** True on PostgreSQL: its placeholders are numbered ($1) where SQLite's are "?". */
export function isPostgres(db: Kysely<any>): boolean {
  return sql`${0}`.compile(db).sql === "$1";
}

/**
 * An integer primary key the database numbers itself: `autoincrement` on SQLite (ids never
 * reused), an identity column on PostgreSQL.
 */
export function idColumn(db: Kysely<any>) {
  return isPostgres(db)
    ? (c: ColumnDefinitionBuilder) => c.primaryKey().generatedByDefaultAsIdentity()
    : (c: ColumnDefinitionBuilder) => c.primaryKey().autoIncrement();
}

/**
 * The current time as the ISO-8601 text the app writes itself (`Date.toISOString()`:
 * 2026-12-01T09:30:00.000Z), for TEXT column defaults. The same string on both engines.
 */
export function nowText(db: Kysely<any>): RawBuilder<string> {
  return isPostgres(db)
    ? sql<string>`(to_char(now() at time zone 'utc', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'))`
    : sql<string>`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`;
}

/** Bytes stored as they are (a PDF, an image, an attachment). */
export function bytesType(db: Kysely<any>): "bytea" | "blob" {
  return isPostgres(db) ? "bytea" : "blob";
}
