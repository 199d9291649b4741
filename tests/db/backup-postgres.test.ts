import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { sql } from "kysely";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import {
  BackupError,
  backupPostgres,
  checkPostgresBackup,
  postgresTool,
  restorePostgres,
} from "@/db/backup";
import { type DB, openPostgres } from "@/db/client";
import { listCustomers } from "@/db/customers";
import { createCustomer, updateCustomer } from "@/lib/customers/manage";
import { latestMigration, migrateToLatest } from "@/db/migrate";
import { databaseUrl, onServer, postgresServerUrl, testEngine } from "../helpers/db";

// `npm run db:backup` / `db:restore` on PostgreSQL: pg_dump -Fc and pg_restore --clean
// --if-exists against the throw-away server (`npm run test:pg`); skipped on SQLite runs, whose
// own backup is tests/db/backup.test.ts. A damaged or foreign file is refused and nothing changes.

const server = postgresServerUrl();
const worker = process.env.VITEST_WORKER_ID ?? String(process.pid);
const SHOP = `counterpoise_backup_shop_${worker}`;
const FOREIGN = `counterpoise_backup_foreign_${worker}`;
let shopUrl: string;
let foreignUrl: string;
let db: DB;
let dir: string;

async function recreate(name: string) {
  await onServer(server!, async (client) => {
    await client.query(`drop database if exists "${name}" with (force)`);
    await client.query(`create database "${name}"`);
  });
}

const names = async () => (await listCustomers(db)).customers.map((c) => c.name).sort();

async function refusal(work: Promise<unknown>): Promise<BackupError["reason"]> {
  const error = await work.then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(BackupError);
  return (error as BackupError).reason;
}

describe.skipIf(testEngine() !== "postgres")("backup and restore on PostgreSQL", () => {
  beforeAll(async () => {
    shopUrl = databaseUrl(server!, SHOP);
    foreignUrl = databaseUrl(server!, FOREIGN);
    await recreate(SHOP);
    await recreate(FOREIGN);
    db = openPostgres(shopUrl, { max: 2 });
    await migrateToLatest(db);
  });

  afterAll(async () => {
    await db?.destroy();
    await onServer(server!, async (client) => {
      await client.query(`drop database if exists "${SHOP}" with (force)`);
      await client.query(`drop database if exists "${FOREIGN}" with (force)`);
    });
  });

  beforeEach(async () => {
    dir = mkdtempSync(path.join(tmpdir(), "counterpoise-pg-backup-"));
    await sql`truncate table customers restart identity cascade`.execute(db);
    await createCustomer(db, { name: "Ada Smithers" }, null);
    await createCustomer(db, { name: "Bram Okafor" }, null);
  });

  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it("dumps in pg_dump's custom format and puts the database back as it was", async () => {
    const file = path.join(dir, "shop.dump");
    const made = await backupPostgres(shopUrl, file);
    // pg_dump's custom format starts with the five bytes "PGDMP" (pg_backup_archiver.c).
    expect(readFileSync(file).subarray(0, 5).toString("latin1")).toBe("PGDMP");
    expect(made.migration).toBe(latestMigration);
    expect(made.bytes).toBeGreaterThan(0);

    const ada = (await listCustomers(db, { search: "ada" })).customers[0]!;
    await updateCustomer(db, ada.id, { name: "Ada Quarrie" }, null);
    await createCustomer(db, { name: "Cato Renwick" }, null);
    expect(await names()).toEqual(["Ada Quarrie", "Bram Okafor", "Cato Renwick"]);

    const previous = path.join(dir, "before.dump");
    const result = await restorePostgres(file, shopUrl, { previousPath: previous });
    expect(result.migration).toBe(latestMigration);
    expect(await names()).toEqual(["Ada Smithers", "Bram Okafor"]);
    // The search index came back with the tables and answers for the restored names.
    expect((await listCustomers(db, { search: "smi" })).customers.map((c) => c.name)).toEqual([
      "Ada Smithers",
    ]);
    // What was replaced is kept, and is itself a backup that can be restored.
    expect((await checkPostgresBackup(previous)).migration).toBe(latestMigration);
    await restorePostgres(previous, shopUrl, { keepPrevious: false });
    expect(await names()).toEqual(["Ada Quarrie", "Bram Okafor", "Cato Renwick"]);
  });

  it("refuses a missing, foreign, damaged or SQLite file and leaves the database alone", async () => {
    const good = path.join(dir, "good.dump");
    await backupPostgres(shopUrl, good);
    await createCustomer(db, { name: "Cato Renwick" }, null);
    const before = await names();

    const text = path.join(dir, "notes.dump");
    writeFileSync(text, "not a backup at all\n");
    const sqliteFile = path.join(dir, "shop.db");
    // The first 16 bytes of a SQLite 3 database (sqlite.org/fileformat.html, 1.3).
    writeFileSync(sqliteFile, Buffer.concat([Buffer.from("SQLite format 3\0"), Buffer.alloc(84)]));
    const cut = path.join(dir, "cut.dump");
    const bytes = readFileSync(good);
    writeFileSync(cut, bytes.subarray(0, Math.floor(bytes.length * 0.6)));
    const flipped = path.join(dir, "flipped.dump");
    const damaged = Buffer.from(bytes);
    for (let i = Math.floor(damaged.length * 0.7); i < damaged.length - 16; i += 97)
      damaged[i]! ^= 0xff;
    writeFileSync(flipped, damaged);
    const foreign = openPostgres(foreignUrl, { max: 1 });
    await sql`create table parts_bin (id integer primary key, label text)`.execute(foreign);
    await sql`insert into parts_bin values (1, 'spare pins')`.execute(foreign);
    await foreign.destroy();
    const foreignDump = path.join(dir, "foreign.dump");
    const other = await refusal(backupPostgres(foreignUrl, foreignDump));
    expect(other).toBe("not_counterpoise");
    // The foreign dump is refused at backup too; make one straight with pg_dump for the restore.
    const dumped = spawnSync(postgresTool("pg_dump"), ["-Fc", `--file=${foreignDump}`, foreignUrl]);
    expect(dumped.status).toBe(0);

    expect(await refusal(restorePostgres(path.join(dir, "absent.dump"), shopUrl))).toBe("missing");
    expect(await refusal(restorePostgres(text, shopUrl))).toBe("not_pg_dump");
    expect(await refusal(restorePostgres(sqliteFile, shopUrl))).toBe("not_pg_dump");
    expect(await refusal(restorePostgres(cut, shopUrl))).toBe("corrupt");
    expect(await refusal(restorePostgres(flipped, shopUrl))).toBe("corrupt");
    expect(await refusal(restorePostgres(foreignDump, shopUrl))).toBe("not_counterpoise");
    expect(await names()).toEqual(before);
  });
});
