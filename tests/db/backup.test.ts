import { type ChildProcess, spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import SQLite from "better-sqlite3";
import { sql } from "kysely";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { BackupError, backupDatabase, checkBackupFile, restoreDatabase } from "@/db/backup";
import { openDatabase } from "@/db/client";
import { listCustomers } from "@/db/customers";
import { createCustomer } from "@/lib/customers/manage";
import { latestMigration, migrateToLatest } from "@/db/migrate";

const root = path.resolve(import.meta.dirname, "../..");
let dir: string;
let writer: ChildProcess | undefined;

beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), "counterpoise-backup-"));
});

afterEach(() => {
  writer?.kill("SIGKILL");
  writer = undefined;
  rmSync(dir, { recursive: true, force: true });
});

/** A migrated database file with the given customers, closed again. */
async function makeShopDatabase(file: string, customerNames: string[]): Promise<void> {
  const db = openDatabase(file);
  await migrateToLatest(db);
  for (const name of customerNames) await createCustomer(db, { name }, null);
  await db.destroy();
}

async function customerNamesIn(file: string): Promise<string[]> {
  const db = openDatabase(file);
  try {
    const { customers } = await listCustomers(db, { limit: 500 });
    return customers.map((c) => c.name).sort();
  } finally {
    await db.destroy();
  }
}

function sha256(file: string): string {
  return createHash("sha256").update(readFileSync(file)).digest("hex");
}

function readOnly<T>(file: string, work: (db: SQLite.Database) => T): T {
  const db = new SQLite(file, { readonly: true, fileMustExist: true });
  try {
    return work(db);
  } finally {
    db.close();
  }
}

// Another process, as the running app would be: every transaction adds one ledger entry and
// moves the running total with it, so a half-applied transaction shows as a mismatch.
const WRITER = `
const SQLite = require("better-sqlite3");
const db = new SQLite(process.argv[1]);
db.pragma("journal_mode = WAL");
db.pragma("busy_timeout = 5000");
const add = db.prepare("insert into ledger (amount, note) values (?, ?)");
const move = db.prepare("update ledger_total set total = total + ?, entries = entries + 1");
const write = db.transaction((n) => { add.run(n % 97, "entry " + n); move.run(n % 97); });
for (let n = 1; ; n++) {
  write(n);
  if (n === 50) process.stdout.write("ready\\n");
}
`;

function startWriter(file: string): Promise<void> {
  writer = spawn(process.execPath, ["-e", WRITER, file], {
    cwd: root,
    stdio: ["ignore", "pipe", "inherit"],
  });
  return new Promise((resolve, reject) => {
    writer!.stdout!.once("data", () => resolve());
    writer!.once("exit", (code) => reject(new Error(`writer stopped early (${code})`)));
  });
}

function maxLedgerId(file: string): number {
  return readOnly(file, (db) => {
    const row = db.prepare("select max(id) as id from ledger").get() as { id: number | null };
    return row.id ?? 0;
  });
}

describe("backupDatabase", () => {
  it("copies a live database while another process keeps writing, missing no committed row", async () => {
    const source = path.join(dir, "live.db");
    const target = path.join(dir, "backups", "copy.db");
    const db = openDatabase(source);
    await migrateToLatest(db);
    await sql`create table ledger (id integer primary key, amount integer not null, note text not null)`.execute(
      db,
    );
    await sql`create table ledger_total (total integer not null, entries integer not null)`.execute(
      db,
    );
    // Enough pages (about 8 MB) that the copy takes a while, with the total kept in step.
    await sql`
      with recursive n(i) as (select 1 union all select i + 1 from n where i < 16000)
      insert into ledger (amount, note) select 0, printf('%.500c', 'x') from n
    `.execute(db);
    await sql`insert into ledger_total values (0, 16000)`.execute(db);
    await db.destroy();

    await startWriter(source);
    const committedBefore = maxLedgerId(source);
    const result = await backupDatabase(source, target);
    const committedAfter = maxLedgerId(source);

    expect(committedAfter).toBeGreaterThan(committedBefore); // the writer was never held up
    expect(result).toMatchObject({ path: target, migration: latestMigration });
    expect(result.bytes).toBeGreaterThan(8_000_000);
    readOnly(target, (copy) => {
      expect(copy.pragma("integrity_check", { simple: true })).toBe("ok");
      const rows = copy
        .prepare("select count(*) as n, max(id) as top, sum(amount) as sum from ledger")
        .get() as { n: number; top: number; sum: number };
      const total = copy.prepare("select total, entries from ledger_total").get() as {
        total: number;
        entries: number;
      };
      expect(rows.top).toBeGreaterThanOrEqual(committedBefore);
      expect(rows.top).toBeLessThanOrEqual(committedAfter);
      expect(rows.n).toBe(rows.top); // no gaps: a prefix of the committed history
      expect(total).toEqual({ total: rows.sum, entries: rows.n });
      expect(copy.pragma("journal_mode", { simple: true })).toBe("delete");
    });
    expect(existsSync(`${target}-wal`)).toBe(false);
  });

  it("refuses a source that does not exist and writes nothing", async () => {
    const target = path.join(dir, "copy.db");
    await expect(backupDatabase(path.join(dir, "absent.db"), target)).rejects.toMatchObject({
      reason: "missing",
    });
    expect(existsSync(target)).toBe(false);
  });
});

describe("restoreDatabase", () => {
  it("replaces the data with the backup's and keeps the replaced database beside it", async () => {
    const live = path.join(dir, "live.db");
    const backup = path.join(dir, "backup.db");
    await makeShopDatabase(live, ["Wren Talbot", "Osric Penn"]);
    await backupDatabase(live, backup);
    const db = openDatabase(live);
    await createCustomer(db, { name: "Added After The Backup" }, null);
    await db.destroy();

    const result = await restoreDatabase(backup, live, { now: new Date("2026-12-01T09:30:05Z") });

    expect(await customerNamesIn(live)).toEqual(["Osric Penn", "Wren Talbot"]);
    expect(result).toEqual({
      path: live,
      previous: `${live}.before-restore-20261201-093005.db`,
      migration: latestMigration,
    });
    expect(await customerNamesIn(result.previous!)).toEqual([
      "Added After The Backup",
      "Osric Penn",
      "Wren Talbot",
    ]);
    readOnly(live, (restored) => {
      expect(restored.pragma("integrity_check", { simple: true })).toBe("ok");
      expect(restored.pragma("journal_mode", { simple: true })).toBe("wal");
    });
  });

  it("shows the restored data to a connection that was already open", async () => {
    const live = path.join(dir, "live.db");
    const backup = path.join(dir, "backup.db");
    await makeShopDatabase(live, ["Wren Talbot"]);
    await backupDatabase(live, backup);
    const app = openDatabase(live);
    await createCustomer(app, { name: "Added After The Backup" }, null);

    await restoreDatabase(backup, live, { keepPrevious: false });

    const { customers } = await listCustomers(app, {});
    expect(customers.map((c) => c.name)).toEqual(["Wren Talbot"]);
    await app.destroy();
  });

  it("creates the target when there is no database yet", async () => {
    const backup = path.join(dir, "backup.db");
    await makeShopDatabase(path.join(dir, "old.db"), ["Wren Talbot"]);
    await backupDatabase(path.join(dir, "old.db"), backup);
    const target = path.join(dir, "new", "counterpoise.db");

    expect(await restoreDatabase(backup, target)).toMatchObject({ previous: null });
    expect(await customerNamesIn(target)).toEqual(["Wren Talbot"]);
  });

  it("puts a backup in place of a damaged database, keeping the damaged file as it was", async () => {
    const live = path.join(dir, "live.db");
    const backup = path.join(dir, "backup.db");
    await makeShopDatabase(live, ["Wren Talbot"]);
    await backupDatabase(live, backup);
    writeFileSync(live, "this was a database until the disk failed");

    const { previous } = await restoreDatabase(backup, live);

    expect(await customerNamesIn(live)).toEqual(["Wren Talbot"]);
    expect(readFileSync(previous!, "utf8")).toBe("this was a database until the disk failed");
  });

  describe("refuses a bad file and leaves the target untouched", () => {
    let live: string;
    let goodBackup: string;

    beforeEach(async () => {
      live = path.join(dir, "live.db");
      goodBackup = path.join(dir, "good.db");
      const names = Array.from({ length: 300 }, (_, i) => `Customer ${String(i).padStart(3, "0")}`);
      await makeShopDatabase(live, names);
      await backupDatabase(live, goodBackup);
    });

    const badFiles: [string, BackupError["reason"], () => string][] = [
      [
        "a text file",
        "not_sqlite",
        () => {
          const file = path.join(dir, "notes.db");
          writeFileSync(file, "crank 2: 1.2 g at 90 degrees\n");
          return file;
        },
      ],
      [
        "an empty file",
        "not_sqlite",
        () => {
          const file = path.join(dir, "empty.db");
          writeFileSync(file, "");
          return file;
        },
      ],
      [
        "a database whose pages were overwritten",
        "corrupt",
        () => {
          const bytes = readFileSync(goodBackup);
          for (let i = 4096; i < bytes.length; i += 7) bytes[i] = (i * 31) & 0xff;
          const file = path.join(dir, "damaged.db");
          writeFileSync(file, bytes);
          return file;
        },
      ],
      [
        "a database cut short",
        "corrupt",
        () => {
          const bytes = readFileSync(goodBackup);
          const file = path.join(dir, "truncated.db");
          writeFileSync(file, bytes.subarray(0, Math.floor(bytes.length / 2)));
          return file;
        },
      ],
      [
        "a SQLite database of something else",
        "not_counterpoise",
        () => {
          const file = path.join(dir, "other.db");
          const other = new SQLite(file);
          other.exec("create table recipes (name text)");
          other.close();
          return file;
        },
      ],
      ["a file that does not exist", "missing", () => path.join(dir, "absent.db")],
    ];

    it.each(badFiles)("%s", async (_label, reason, make) => {
      const file = make();
      const before = sha256(live);

      await expect(checkBackupFile(file)).rejects.toMatchObject({ reason });
      const attempt = restoreDatabase(file, live);
      await expect(attempt).rejects.toBeInstanceOf(BackupError);
      await expect(attempt).rejects.toMatchObject({ reason });

      expect(sha256(live)).toBe(before);
      expect(existsSync(`${live}-wal`) ? readFileSync(`${live}-wal`).length : 0).toBe(0);
      expect(readdirSync(dir).filter((f) => f.includes("before-restore"))).toEqual([]);
      expect(await customerNamesIn(live)).toHaveLength(300);
    });
  });
});

describe("npm run db:backup and db:restore", () => {
  it("back up the database named by DATABASE_PATH and put it back", async () => {
    const live = path.join(dir, "live.db");
    const backup = path.join(dir, "nightly.db");
    await makeShopDatabase(live, ["Wren Talbot"]);
    const env = { ...process.env, DATABASE_PATH: live };
    const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");

    const backedUp = spawnSync(process.execPath, [tsx, "scripts/backup.ts", backup], {
      cwd: root,
      env,
      encoding: "utf8",
    });
    expect(backedUp.stderr).toBe("");
    expect(backedUp.status).toBe(0);
    expect(backedUp.stdout).toContain(backup);

    const db = openDatabase(live);
    await createCustomer(db, { name: "Added After The Backup" }, null);
    await db.destroy();

    const restored = spawnSync(process.execPath, [tsx, "scripts/restore.ts", backup], {
      cwd: root,
      env,
      encoding: "utf8",
    });
    expect(restored.status).toBe(0);
    expect(restored.stdout).toContain("kept as");
    expect(await customerNamesIn(live)).toEqual(["Wren Talbot"]);

    const refused = spawnSync(process.execPath, [tsx, "scripts/restore.ts", live + "-nope"], {
      cwd: root,
      env,
      encoding: "utf8",
    });
    expect(refused.status).toBe(1);
    expect(refused.stderr).toContain("the database was not changed");
  }, 60_000);
});
