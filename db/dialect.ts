import { type Kysely, type SelectQueryBuilder, sql } from "kysely";
import type { Database } from "./schema";

// The few places where SQLite and PostgreSQL need different SQL, each behind one function. The
// rest of db/ writes SQL both engines read the same way.

export type Dialect = "sqlite" | "postgres";

/** Which engine a database (or a transaction on one) runs on. */
export function dialectOf(db: Kysely<Database>): Dialect {
  // PostgreSQL numbers its placeholders ($1); SQLite writes "?".
  return sql`${0}`.compile(db).sql === "$1" ? "postgres" : "sqlite";
}

export function isPostgres(db: Kysely<Database>): boolean {
  return dialectOf(db) === "postgres";
}

/** True when the table exists (in the current schema on PostgreSQL). */
export async function tableExists(db: Kysely<Database>, name: string): Promise<boolean> {
  const { rows } = isPostgres(db)
    ? await sql<{ n: number }>`
        select count(*)::int as n from information_schema.tables
        where table_schema = current_schema() and table_name = ${name}
      `.execute(db)
    : await sql<{ n: number }>`
        select count(*) as n from sqlite_master where type = 'table' and name = ${name}
      `.execute(db);
  return Number(rows[0]?.n ?? 0) > 0;
}

/**
 * Locks the rows a read-then-write transaction selects until it commits (`for update`) on
 * PostgreSQL, where several connections write at once: a second writer waits, then reads the
 * row as the first left it (and sees the new version). SQLite takes one writer at a time (and
 * the app holds one connection), so it needs no lock and has no such clause. With a join, name
 * the table whose rows are written (`of`), so the joined rows are not locked too.
 *
 * @example await trx.selectFrom("jobs").selectAll().where("id", "=", id).$call(forUpdate(trx))
 */
export function forUpdate<TB extends string = never>(db: Kysely<Database>, of?: TB) {
  const lock = isPostgres(db);
  return <DB, T extends keyof DB, O>(
    qb: SelectQueryBuilder<DB, T, O>,
  ): SelectQueryBuilder<DB, T, O> =>
    lock ? qb.forUpdate(of as Parameters<typeof qb.forUpdate>[0]) : qb;
}

/** A write refused because a unique value (or key) is already taken, on either engine. */
export function isUniqueViolation(error: unknown): boolean {
  const code = (error as { code?: unknown } | null)?.code;
  return (
    code === "23505" ||
    code === "SQLITE_CONSTRAINT_UNIQUE" ||
    code === "SQLITE_CONSTRAINT_PRIMARYKEY"
  );
}

/** Tables whose rows writers lock by id before reading what they will change. */
export type LockableTable = "jobs" | "invoices" | "quotes" | "price_items";

/**
 * Takes one row's lock for the rest of the transaction on PostgreSQL (nothing on SQLite, which
 * runs one writer at a time): a second writer of the same row waits until the first commits,
 * then reads what the first wrote, so a version check or a running total cannot be based on a
 * row someone is changing. Take it before reading the row.
 */
export async function lockRow(
  db: Kysely<Database>,
  table: LockableTable,
  id: number,
): Promise<void> {
  if (!isPostgres(db)) return;
  await sql`select id from ${sql.table(table)} where id = ${id} for update`.execute(db);
}

/**
 * Takes a job's row lock (see lockRow). Writers of a job's parts (weights, targets, rotating-part
 * records) take it first, so two saves of the same part queue up instead of both reading the same
 * version (or both inserting a part not weighed yet), and no two of them can lock each other's
 * rows in opposite order.
 */
export async function lockJob(db: Kysely<Database>, jobId: number): Promise<void> {
  await lockRow(db, "jobs", jobId);
}
