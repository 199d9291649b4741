import {
  type MigrationProvider,
  type MigrationResultSet,
  Migrator,
  NO_MIGRATIONS,
  sql,
} from "kysely";
import { migrations } from "@/migrations";
import type { DB } from "./client";
import { tableExists } from "./dialect";

const staticProvider: MigrationProvider = { getMigrations: async () => migrations };

function check(result: MigrationResultSet): MigrationResultSet {
  if (result.error) throw result.error;
  return result;
}

/** Brings the database to the latest migration; throws on the first failure. */
export async function migrateToLatest(db: DB, provider: MigrationProvider = staticProvider) {
  return check(await new Migrator({ db, provider }).migrateToLatest());
}

/** Rolls back every migration (tests use it to prove `down` works). */
export async function migrateToEmpty(db: DB, provider: MigrationProvider = staticProvider) {
  return check(await new Migrator({ db, provider }).migrateTo(NO_MIGRATIONS));
}

/** The name of the last applied migration, or null for an empty database. */
export async function findMigrationLevel(db: DB): Promise<string | null> {
  if (!(await tableExists(db, "kysely_migration"))) return null;
  const row = await sql<{ name: string }>`
    select name from kysely_migration order by name desc limit 1
  `.execute(db);
  return row.rows[0]?.name ?? null;
}

export const latestMigration = Object.keys(migrations).sort().at(-1) ?? null;
