import { spawn } from "node:child_process";
import { existsSync, readdirSync } from "node:fs";
import { copyFile, mkdir, open, rename, rm, stat } from "node:fs/promises";
import { delimiter, dirname, join } from "node:path";
import SQLite from "better-sqlite3";

/** Why a file was not accepted as a backup; the target is never touched when one is thrown. */
export class BackupError extends Error {
  constructor(
    readonly reason:
      "missing" | "not_sqlite" | "not_pg_dump" | "corrupt" | "not_counterpoise" | "tool_missing",
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

// ---------------------------------------------------------------------------------------------
// PostgreSQL (DATABASE_URL set): the server's own tools, pg_dump in its custom format (-Fc) and
// pg_restore, found in PG_BIN, else Debian's /usr/lib/postgresql/<newest>/bin, else on PATH.

// The first five bytes of every pg_dump custom-format archive (pg_backup_archiver.c: "PGDMP").
const PG_DUMP_MAGIC = Buffer.from("PGDMP", "latin1");

/** The full path of pg_dump or pg_restore. @throws BackupError ("tool_missing") when not found. */
export function postgresTool(program: "pg_dump" | "pg_restore"): string {
  const candidates: string[] = [];
  if (process.env.PG_BIN) candidates.push(process.env.PG_BIN);
  const debian = "/usr/lib/postgresql";
  if (existsSync(debian)) {
    candidates.push(
      ...readdirSync(debian)
        .filter((v) => /^\d+$/.test(v))
        .sort((a, b) => Number(b) - Number(a))
        .map((v) => join(debian, v, "bin")),
    );
  }
  for (const dir of (process.env.PATH ?? "").split(delimiter)) if (dir) candidates.push(dir);
  const found = candidates.map((dir) => join(dir, program)).find((full) => existsSync(full));
  if (!found) {
    throw new BackupError(
      "tool_missing",
      `${program} was not found: install PostgreSQL's client programs (Debian: postgresql-client) or set PG_BIN to the folder holding them.`,
    );
  }
  return found;
}

/**
 * The connection settings of a postgres:// address as libpq's environment variables, so the
 * password never shows on a command line (where `ps` would show it).
 */
function libpqEnvironment(url: string): NodeJS.ProcessEnv {
  const u = new URL(url);
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const key of ["PGHOST", "PGPORT", "PGUSER", "PGPASSWORD", "PGDATABASE", "PGSSLMODE"])
    delete env[key];
  if (u.hostname) env.PGHOST = decodeURIComponent(u.hostname.replace(/^\[|\]$/g, ""));
  if (u.port) env.PGPORT = u.port;
  if (u.username) env.PGUSER = decodeURIComponent(u.username);
  if (u.password) env.PGPASSWORD = decodeURIComponent(u.password);
  const database = decodeURIComponent(u.pathname.replace(/^\//, ""));
  if (database) env.PGDATABASE = database;
  const host = u.searchParams.get("host");
  if (host) env.PGHOST = host;
  const sslmode = u.searchParams.get("sslmode");
  if (sslmode) env.PGSSLMODE = sslmode;
  return env;
}

/** Runs a PostgreSQL program; its standard output (when asked for) and error, and its code. */
function runTool(
  program: "pg_dump" | "pg_restore",
  args: string[],
  options: { url?: string; keepOutput?: boolean } = {},
): Promise<{ code: number; stdout: string; stderr: string }> {
  const command = postgresTool(program);
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, {
      env: options.url ? libpqEnvironment(options.url) : process.env,
      stdio: ["ignore", "pipe", "pipe"],
    });
    const out: Buffer[] = [];
    let err = "";
    child.stdout.on("data", (chunk: Buffer) => {
      if (options.keepOutput) out.push(chunk);
    });
    child.stderr.on("data", (chunk: Buffer) => {
      if (err.length < 20_000) err += chunk.toString("utf8");
    });
    child.on("error", reject);
    child.on("close", (code) =>
      resolve({ code: code ?? 1, stdout: Buffer.concat(out).toString("utf8"), stderr: err.trim() }),
    );
  });
}

/**
 * Dumps a PostgreSQL database with `pg_dump -Fc` (the custom format, compressed, one consistent
 * snapshot while the app keeps writing). The archive is written beside the target and renamed
 * into place only once it reads back whole (checkPostgresBackup), so a half-written dump never
 * carries the target's name. Owners and grants are left out: the restore makes the objects
 * belong to whoever restores them.
 *
 * @example await backupPostgres("postgres://shop@db.internal/counterpoise", "data/backups/x.dump")
 * @throws BackupError when pg_dump is missing or fails, or its archive does not read back.
 */
export async function backupPostgres(url: string, targetPath: string): Promise<BackupResult> {
  await mkdir(dirname(targetPath), { recursive: true });
  const partial = `${targetPath}.partial-${process.pid}`;
  await rm(partial, { force: true });
  try {
    const dumped = await runTool(
      "pg_dump",
      ["--format=custom", "--no-owner", "--no-privileges", `--file=${partial}`],
      { url },
    );
    if (dumped.code !== 0) {
      throw new BackupError("corrupt", `pg_dump failed: ${dumped.stderr || `exit ${dumped.code}`}`);
    }
    const { migration } = await checkPostgresBackup(partial);
    await rename(partial, targetPath);
    return { path: targetPath, bytes: (await stat(targetPath)).size, migration };
  } finally {
    await rm(partial, { force: true });
  }
}

/**
 * Checks that a file is a usable PostgreSQL backup without changing anything: pg_dump's custom
 * format header, every block readable (pg_restore converts the whole archive, discarding the
 * script) and the migrations table every Counterpoise database has.
 *
 * @throws BackupError saying what is wrong with the file.
 */
export async function checkPostgresBackup(path: string): Promise<{ migration: string | null }> {
  if (!(await isFile(path))) throw new BackupError("missing", `There is no file at ${path}.`);
  const file = await open(path, "r");
  try {
    const head = Buffer.alloc(PG_DUMP_MAGIC.length);
    const { bytesRead } = await file.read(head, 0, head.length, 0);
    if (bytesRead !== head.length || !head.equals(PG_DUMP_MAGIC))
      throw new BackupError(
        "not_pg_dump",
        `${path} is not a PostgreSQL backup (pg_dump's custom format, -Fc).`,
      );
  } finally {
    await file.close();
  }
  const whole = await runTool("pg_restore", ["--file=/dev/null", path]);
  if (whole.code !== 0)
    throw new BackupError("corrupt", `${path} cannot be read whole: ${firstLines(whole.stderr)}`);
  const list = await runTool("pg_restore", ["--list", path], { keepOutput: true });
  if (list.code !== 0 || !/ TABLE DATA \S+ kysely_migration( |$)/m.test(list.stdout))
    throw new BackupError("not_counterpoise", `${path} is not a Counterpoise database.`);
  const data = await runTool(
    "pg_restore",
    ["--data-only", "--table=kysely_migration", "--file=-", path],
    { keepOutput: true },
  );
  return { migration: lastMigrationIn(data.stdout) };
}

/** The greatest migration name in the COPY block of a kysely_migration data script. */
function lastMigrationIn(script: string): string | null {
  const lines = script.split("\n");
  const start = lines.findIndex((l) => /^COPY \S*kysely_migration \(/.test(l));
  if (start < 0) return null;
  let last: string | null = null;
  for (const line of lines.slice(start + 1)) {
    if (line === "\\.") break;
    const name = line.split("\t")[0] ?? "";
    if (name && (last === null || name > last)) last = name;
  }
  return last;
}

function firstLines(text: string): string {
  return text.split("\n").slice(0, 3).join("; ") || "pg_restore failed";
}

/**
 * Replaces a PostgreSQL database's contents with a backup: `pg_restore --clean --if-exists` in
 * one transaction (all or nothing), owners and grants left to whoever restores. The backup is
 * checked first (checkPostgresBackup), and unless `keepPrevious` is false the database as it was
 * is dumped to `previousPath` (default: beside the backup, `before-restore-<time>.dump`), so a
 * refused file or a failed restore changes nothing.
 *
 * @example await restorePostgres("data/backups/x.dump", "postgres://shop@db.internal/counterpoise")
 * @throws BackupError when the backup is missing, not a pg_dump archive, damaged, not one of
 * ours, or pg_restore fails (the transaction is then rolled back).
 */
export async function restorePostgres(
  backupPath: string,
  url: string,
  options: { keepPrevious?: boolean; previousPath?: string; now?: Date } = {},
): Promise<RestoreResult> {
  const { migration } = await checkPostgresBackup(backupPath);
  let previous: string | null = null;
  if (options.keepPrevious !== false) {
    previous =
      options.previousPath ??
      join(dirname(backupPath), `before-restore-${fileStamp(options.now ?? new Date())}.dump`);
    await backupPostgres(url, previous);
  }
  const restored = await runTool(
    "pg_restore",
    [
      "--clean",
      "--if-exists",
      "--no-owner",
      "--no-privileges",
      "--single-transaction",
      "--exit-on-error",
      "--dbname=" + (libpqEnvironment(url).PGDATABASE ?? ""),
      backupPath,
    ],
    { url },
  );
  if (restored.code !== 0)
    throw new BackupError(
      "corrupt",
      `pg_restore failed, nothing was changed: ${firstLines(restored.stderr)}`,
    );
  const safeUrl = new URL(url);
  safeUrl.password = "";
  return { path: safeUrl.toString(), previous, migration };
}
