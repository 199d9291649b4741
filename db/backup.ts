import { copyFile, mkdir, open, rename, rm, stat } from "node:fs/promises";
import { dirname } from "node:path";
import SQLite from "better-sqlite3";

/** Why a file was not accepted as a backup; the target is never touched when one is thrown. */
export class BackupError extends Error {
  constructor(
    readonly reason: "missing" | "not_sqlite" | "corrupt" | "not_counterpoise",
    message: string,
  ) {
    super(message);
    this.name = "BackupError";
  }
}

export interface BackupResult {
  path: string;
  bytes: number;
  /** The last migration applied in the copy (null if the copy has none). */
  migration: string | null;
}

export interface RestoreResult {
  path: string;
  /** Where the database that was replaced was kept, or null if there was none (or it was not kept). */
  previous: string | null;
  migration: string | null;
}

// The first 16 bytes of every SQLite 3 database file (sqlite.org/fileformat.html, 1.3).
const SQLITE_MAGIC = Buffer.from("SQLite format 3\0", "latin1");

// Copy every page in one step: the copy is one consistent snapshot, and a writer on another
// connection cannot make the backup start over (which it does between steps).
const ALL_PAGES = 0x7fffffff;

/**
 * Copies a live database with SQLite's online backup API. Writers on other connections carry on
 * (WAL readers do not block them) and the copy holds every transaction committed before it began.
 * The copy is written beside the target and renamed into place only once it passes
 * `PRAGMA integrity_check`, so a half-written backup never carries the target's name.
 *
 * @throws BackupError when the source is missing or the copy fails its integrity check.
 */
export async function backupDatabase(
  sourcePath: string,
  targetPath: string,
): Promise<BackupResult> {
  if (!(await isFile(sourcePath)))
    throw new BackupError("missing", `There is no database at ${sourcePath}.`);
  await mkdir(dirname(targetPath), { recursive: true });
  const partial = `${targetPath}.partial-${process.pid}`;
  await removeDatabaseFiles(partial);
  try {
    await copyWithBackupApi(sourcePath, partial);
    // A backup file stands alone: no -wal or -shm beside it.
    withDatabase(partial, false, (db) => db.pragma("journal_mode = DELETE"));
    const { migration } = inspectDatabase(partial);
    await rename(partial, targetPath);
    return { path: targetPath, bytes: (await stat(targetPath)).size, migration };
  } finally {
    await removeDatabaseFiles(partial);
  }
}

/**
 * Replaces the database at `targetPath` with the contents of a backup. The backup must be a
 * SQLite file that passes `PRAGMA integrity_check` and holds a migrated Counterpoise database;
 * otherwise nothing is changed. The database being replaced is first kept beside it as
 * `<target>.before-restore-<time>.db` unless `keepPrevious` is false.
 *
 * @throws BackupError when the backup is missing, not SQLite, damaged, or not one of ours.
 */
export async function restoreDatabase(
  backupPath: string,
  targetPath: string,
  options: { keepPrevious?: boolean; now?: Date } = {},
): Promise<RestoreResult> {
  const { migration } = await checkBackupFile(backupPath);
  await mkdir(dirname(targetPath), { recursive: true });

  let previous: string | null = null;
  if (await isFile(targetPath)) {
    const readable = isReadableDatabase(targetPath);
    if (options.keepPrevious !== false) {
      previous = `${targetPath}.before-restore-${fileStamp(options.now ?? new Date())}.db`;
      const kept = previous;
      // A file SQLite cannot copy cleanly is kept byte for byte instead.
      if (!readable) await copyRawFiles(targetPath, kept);
      else await backupDatabase(targetPath, kept).catch(() => copyRawFiles(targetPath, kept));
    }
    // A damaged file cannot take part in a backup: start the target afresh.
    if (!readable) await removeDatabaseFiles(targetPath);
  }

  // Writing through SQLite (not swapping files) keeps any open connection's view consistent.
  await copyWithBackupApi(backupPath, targetPath);
  withDatabase(targetPath, false, (db) => db.pragma("journal_mode = WAL"));
  inspectDatabase(targetPath);
  return { path: targetPath, previous, migration };
}

/**
 * Checks that a file is a usable backup without changing it: the SQLite header, a clean
 * `PRAGMA integrity_check`, and the migrations table every Counterpoise database has.
 *
 * @throws BackupError saying what is wrong with the file.
 */
export async function checkBackupFile(path: string): Promise<{ migration: string | null }> {
  if (!(await isFile(path))) throw new BackupError("missing", `There is no file at ${path}.`);
  if (!(await hasSqliteHeader(path)))
    throw new BackupError("not_sqlite", `${path} is not a SQLite database.`);
  const { migration, hasMigrations } = inspectDatabase(path);
  if (!hasMigrations)
    throw new BackupError("not_counterpoise", `${path} is not a Counterpoise database.`);
  return { migration };
}

function inspectDatabase(path: string): { migration: string | null; hasMigrations: boolean } {
  let result: { problems: string[]; hasMigrations: boolean; migration: string | null };
  try {
    result = withDatabase(path, true, (db) => {
      const problems = (db.pragma("integrity_check") as { integrity_check: string }[])
        .map((r) => r.integrity_check)
        .filter((r) => r !== "ok");
      const hasMigrations = !!db
        .prepare("select 1 from sqlite_master where type = 'table' and name = 'kysely_migration'")
        .get();
      const last = hasMigrations
        ? (db.prepare("select max(name) as name from kysely_migration").get() as {
            name: string | null;
          })
        : undefined;
      return { problems, hasMigrations, migration: last?.name ?? null };
    });
  } catch (error) {
    throw new BackupError(
      "corrupt",
      `${path} cannot be read as a database: ${error instanceof Error ? error.message : error}`,
    );
  }
  if (result.problems.length > 0)
    throw new BackupError(
      "corrupt",
      `${path} fails the integrity check: ${result.problems.slice(0, 3).join("; ")}`,
    );
  return result;
}

function isReadableDatabase(path: string): boolean {
  try {
    return withDatabase(path, true, (db) => db.pragma("quick_check", { simple: true }) === "ok");
  } catch {
    return false;
  }
}

async function copyWithBackupApi(sourcePath: string, targetPath: string): Promise<void> {
  const source = new SQLite(sourcePath, { readonly: true, fileMustExist: true });
  try {
    source.pragma("busy_timeout = 5000");
    await source.backup(targetPath, { progress: () => ALL_PAGES });
  } finally {
    source.close();
  }
}

function withDatabase<T>(path: string, readonly: boolean, work: (db: SQLite.Database) => T): T {
  const db = new SQLite(path, { readonly, fileMustExist: true });
  try {
    db.pragma("busy_timeout = 5000");
    return work(db);
  } finally {
    db.close();
  }
}

async function hasSqliteHeader(path: string): Promise<boolean> {
  const file = await open(path, "r");
  try {
    const head = Buffer.alloc(SQLITE_MAGIC.length);
    const { bytesRead } = await file.read(head, 0, head.length, 0);
    return bytesRead === head.length && head.equals(SQLITE_MAGIC);
  } finally {
    await file.close();
  }
}

async function copyRawFiles(sourcePath: string, targetPath: string): Promise<void> {
  await copyFile(sourcePath, targetPath);
  for (const suffix of ["-wal"])
    if (await isFile(sourcePath + suffix)) await copyFile(sourcePath + suffix, targetPath + suffix);
}

async function removeDatabaseFiles(path: string): Promise<void> {
  for (const suffix of ["", "-wal", "-shm", "-journal"]) await rm(path + suffix, { force: true });
}

async function isFile(path: string): Promise<boolean> {
  return stat(path).then(
    (s) => s.isFile(),
    () => false,
  );
}

/** 2026-12-01T09:30:05.123Z → 20261201-093005: sortable and safe in a file name. */
export function fileStamp(at: Date): string {
  return at
    .toISOString()
    .replace(/\.\d+Z$/, "")
    .replace(/[-:]/g, "")
    .replace("T", "-");
}
