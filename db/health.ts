import { sql } from "kysely";
import type { DB } from "./client";
import { findMigrationLevel } from "./migrate";

/** What the health check learns from the database. */
export interface DatabaseHealth {
  /** The newest migration applied, or null when the database has never been migrated. */
  migration: string | null;
}

/**
 * Reaches the database and reads its migration level, on either engine: the statement that
 * proves the connection (`select 1`) reads the same on SQLite and PostgreSQL, and where the two
 * differ (whether the migrations table exists) db/dialect.ts answers for each. Throws when the
 * database cannot be reached.
 */
export async function readDatabaseHealth(db: DB): Promise<DatabaseHealth> {
  await sql`select 1`.execute(db);
  return { migration: await findMigrationLevel(db) };
}
