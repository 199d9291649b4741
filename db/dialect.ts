import { type Kysely, type SelectQueryBuilder, sql } from "kysely";

// The few places where SQLite and PostgreSQL need different SQL, each behind one function. The
// rest of db/ writes SQL both engines read the same way.

export type Dialect = "sqlite" | "postgres";

/** Which engine a database (or a transaction on one) runs on. */
export function dialectOf(db: Kysely<any>): Dialect {
  // PostgreSQL numbers its placeholders ($1); SQLite writes "?".
  return sql`${0}`.compile(db).sql === "$1" ? "postgres" : "sqlite";
}

export function isPostgres(db: Kysely<any>): boolean {
  return dialectOf(db) === "postgres";
}

/** True when the table exists (in the current schema on PostgreSQL). */
export async function tableExists(db: Kysely<any>, name: string): Promise<boolean> {
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
 * PostgreSQL, where several connections write at once. SQLite takes one writer at a time (and
 * the app holds one connection), so it needs no lock and has no such clause.
 *
 * @example await trx.selectFrom("jobs").selectAll().where("id", "=", id).$call(forUpdate(trx))
 */
export function forUpdate(db: Kysely<any>) {
  const lock = isPostgres(db);
  return <DB, TB extends keyof DB, O>(
    qb: SelectQueryBuilder<DB, TB, O>,
  ): SelectQueryBuilder<DB, TB, O> => (lock ? qb.forUpdate() : qb);
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
