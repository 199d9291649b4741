// Brings the database (DATABASE_URL on PostgreSQL, else the SQLite file at DATABASE_PATH) to the
// latest migration. Exits non-zero on failure.
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { FileMigrationProvider, type MigrationProvider } from "kysely";
import { openConfiguredDatabase } from "@/db/client";
import { migrateToLatest } from "@/db/migrate";

const folder = path.join(path.dirname(fileURLToPath(import.meta.url)), "..", "migrations");
const provider = new FileMigrationProvider({ fs, path, migrationFolder: folder });

// FileMigrationProvider imports every file in the folder; the static map is not a migration.
const files: MigrationProvider = {
  async getMigrations() {
    const all = await provider.getMigrations();
    delete all["index"];
    return all;
  },
};

const db = openConfiguredDatabase();
try {
  const { results } = await migrateToLatest(db, files);
  for (const r of results ?? [])
    console.log(`${r.status === "Success" ? "applied" : r.status}: ${r.migrationName}`);
  if (!results?.length) console.log("database already at the latest migration");
} catch (error) {
  console.error("migration failed:", error);
  process.exitCode = 1;
} finally {
  await db.destroy();
}
