import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import SQLite from "better-sqlite3";
import { Kysely, SqliteDialect } from "kysely";
import { env } from "@/lib/env";
import type { Database } from "./schema";

export type DB = Kysely<Database>;

/** Opens a SQLite file (or ":memory:") with the pragmas the app relies on. */
export function openDatabase(path: string): DB {
  if (path !== ":memory:") mkdirSync(dirname(path), { recursive: true });
  const sqlite = new SQLite(path);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("foreign_keys = ON");
  sqlite.pragma("busy_timeout = 5000");
  sqlite.pragma("synchronous = NORMAL");
  return new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
}

const holder = globalThis as unknown as { counterpoiseDb?: DB };

/** The app's database, opened on first use (not at import) and kept across hot reloads. */
export function getDb(): DB {
  holder.counterpoiseDb ??= openDatabase(env().DATABASE_PATH);
  return holder.counterpoiseDb;
}

/** Tests put their own migrated in-memory database in place of the file. */
export function setDb(db: DB | undefined): void {
  holder.counterpoiseDb = db;
}
