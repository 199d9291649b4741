import { inject } from "vitest";
import pg from "pg";
import { sql } from "kysely";
import { type DB, openDatabase, openPostgres, setDb } from "@/db/client";
import type { Customer } from "@/db/customers";
import { createCustomer } from "@/lib/customers/manage";
import { migrateToLatest } from "@/db/migrate";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { createUser } from "@/lib/users/manage";
import { hashPassword } from "@/lib/auth/password";

export const TEST_PASSWORD = "correct horse battery";

// Which engine the tests run on: SQLite in memory by default; PostgreSQL under
// vitest.pg.config.ts (`npm run test:pg`), whose global setup provides the server's address.
declare module "vitest" {
  export interface ProvidedContext {
    /** The PostgreSQL server (its `postgres` database); absent on SQLite runs. */
    pgServerUrl?: string;
    /** What tests/helpers/pg-global-setup.ts found in the migrated template database. */
    pgTemplate?: PgTemplate;
  }
}

/** Every table of a PostgreSQL database (not Kysely's own) and the rows in those that have any. */
export interface TableSnapshot {
  tables: string[];
  /** Rows as JSON; `identity` when the table's `id` is numbered by the database. */
  seeds: { table: string; rows: string; identity: boolean }[];
}

/** The migrated template database: the rows in it are the ones the migrations put in. */
export interface PgTemplate extends TableSnapshot {
  name: string;
}

function provided<K extends "pgServerUrl" | "pgTemplate">(key: K) {
  try {
    return inject(key);
  } catch {
    return undefined;
  }
}

/** The PostgreSQL server these tests run against, or undefined for SQLite. */
export function postgresServerUrl(): string | undefined {
  return provided("pgServerUrl");
}

export function testEngine(): "sqlite" | "postgres" {
  return postgresServerUrl() ? "postgres" : "sqlite";
}

/** The same server address with another database name. */
export function databaseUrl(server: string, name: string): string {
  const url = new URL(server);
  url.pathname = `/${name}`;
  return url.toString();
}

/** Runs statements on the server's own database (creating and dropping databases). */
export async function onServer<T>(server: string, work: (client: pg.Client) => Promise<T>) {
  const client = new pg.Client({ connectionString: server });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

/** Makes the database unless it exists, as an empty one or as a copy of `template`. */
async function ensureDatabase(server: string, name: string, template?: string): Promise<void> {
  await onServer(server, async (client) => {
    const found = await client.query("select 1 from pg_database where datname = $1", [name]);
    made.add(name);
    if (found.rowCount !== 0) return;
    for (let attempt = 1; ; attempt++) {
      try {
        await client.query(`create database "${name}"${template ? ` template "${template}"` : ""}`);
        return;
      } catch (error) {
        // Two databases copied from one template at the same moment: the copy waits its turn.
        if (attempt >= 20 || !/being accessed by other users/.test(String(error))) throw error;
        await new Promise((r) => setTimeout(r, 250));
      }
    }
  });
}

// Each test file has its own databases on the server (files run side by side in several
// workers; VITEST_WORKER_ID differs for every one, where VITEST_POOL_ID may not).
const worker = process.env.VITEST_WORKER_ID ?? String(process.pid);
const opened: DB[] = [];
const made = new Set<string>();
let pgTestDb: DB | undefined;

async function pgTestDatabase(server: string, template: PgTemplate): Promise<DB> {
  if (pgTestDb) return pgTestDb;
  const name = `counterpoise_test_${worker}`;
  // A copy of the template the global setup migrated once.
  await ensureDatabase(server, name, template.name);
  // Several connections, so concurrent requests in a test really run side by side.
  const db = openPostgres(databaseUrl(server, name), { max: 8 });
  opened.push(db);
  await migrateToLatest(db); // nothing to do: the copy is at the latest migration
  pgTestDb = db;
  return db;
}

async function recreatePgTestDatabase(server: string, template: PgTemplate): Promise<DB> {
  const name = `counterpoise_test_${worker}`;
  if (pgTestDb) {
    opened.splice(opened.indexOf(pgTestDb), 1);
    await pgTestDb.destroy();
    pgTestDb = undefined;
  }
  await onServer(server, (client) =>
    client.query(`drop database if exists "${name}" with (force)`),
  );
  return pgTestDatabase(server, template);
}

/** The tables of a PostgreSQL database, not Kysely's own. */
async function pgTableNames(db: DB): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`
    select table_name as name from information_schema.tables
    where table_schema = current_schema() and table_type = 'BASE TABLE'
      and table_name not like 'kysely_%'
    order by table_name
  `.execute(db);
  return rows.map((r) => r.name);
}

/** Takes every row of every table of a PostgreSQL database, to be put back by restoreTables. */
export async function snapshotTables(db: DB): Promise<TableSnapshot> {
  const snapshot: TableSnapshot = { tables: await pgTableNames(db), seeds: [] };
  for (const table of snapshot.tables) {
    const data = await sql<{ rows: string; n: number }>`
      select coalesce(json_agg(t), '[]')::text as rows, count(*)::int as n from ${sql.table(table)} t
    `.execute(db);
    if (!data.rows[0]?.n) continue;
    const identity = await sql<{ n: number }>`
      select count(*)::int as n from information_schema.columns
      where table_schema = current_schema() and table_name = ${table}
        and column_name = 'id' and is_identity = 'YES'
    `.execute(db);
    snapshot.seeds.push({ table, rows: data.rows[0].rows, identity: !!identity.rows[0]?.n });
  }
  return snapshot;
}

/**
 * Empties every table (TRUNCATE … RESTART IDENTITY CASCADE) and puts the snapshot's rows back;
 * numbering goes on after the highest id put back, or from 1.
 */
export async function restoreTables(db: DB, snapshot: TableSnapshot): Promise<void> {
  if (snapshot.tables.length === 0) return;
  const tables = sql.join(snapshot.tables.map((t) => sql.table(t)));
  await db.transaction().execute(async (trx) => {
    // Rows go back table by table in any order: foreign keys (checked by triggers on PostgreSQL)
    // are not checked for this transaction. They held when the snapshot was taken.
    if (snapshot.seeds.length > 0)
      await sql`set local session_replication_role = replica`.execute(trx);
    await sql`truncate table ${tables} restart identity cascade`.execute(trx);
    for (const seed of snapshot.seeds) {
      await sql`
        insert into ${sql.table(seed.table)}
        select * from json_populate_recordset(null::${sql.table(seed.table)}, ${seed.rows}::json)
      `.execute(trx);
      if (seed.identity) {
        await sql`
          select setval(pg_get_serial_sequence(${seed.table}, 'id'),
            (select max(id) from ${sql.table(seed.table)}))
        `.execute(trx);
      }
    }
  });
}

/**
 * A digest of every row of every table of a PostgreSQL database: equal before and after means
 * nothing was written (SQLite tells the same by counting changes).
 */
export async function fingerprintTables(db: DB): Promise<string> {
  const tables = await pgTableNames(db);
  const parts = tables.map(
    (t) =>
      sql<string>`(select ${t} || ':' || coalesce(md5(string_agg(x::text, '|' order by x::text)), '') from ${sql.table(t)} x)`,
  );
  if (parts.length === 0) return "";
  const { rows } = await sql<{ digest: string }>`
    select md5(concat_ws(',', ${sql.join(parts)})) as digest
  `.execute(db);
  return rows[0]?.digest ?? "";
}

/**
 * A migrated database holding nothing but what the migrations put in, installed as the app's
 * database. SQLite: a new in-memory database each call. PostgreSQL: this worker's database,
 * migrated once and emptied (TRUNCATE … RESTART IDENTITY CASCADE) at each call, so a test
 * sees ids from 1 as on SQLite; every call returns the same handle.
 */
export async function freshDb(): Promise<DB> {
  const server = postgresServerUrl();
  const template = provided("pgTemplate");
  if (!server || !template) {
    const db = openDatabase(":memory:");
    await migrateToLatest(db);
    setDb(db);
    return db;
  }
  let db = await pgTestDatabase(server, template);
  try {
    await restoreTables(db, template);
  } catch {
    // A test changed the schema itself (dropped a table to make a write fail, say): start this
    // file's database again from the template.
    db = await recreatePgTestDatabase(server, template);
    await restoreTables(db, template);
  }
  setDb(db);
  return db;
}

/**
 * A database with no tables at all, not installed (for migration tests). SQLite: a new one in
 * memory. PostgreSQL: this worker's scratch database with its schema dropped and made again.
 */
export async function emptyDb(): Promise<DB> {
  const server = postgresServerUrl();
  if (!server) return openDatabase(":memory:");
  const name = `counterpoise_scratch_${worker}`;
  await ensureDatabase(server, name);
  const db = openPostgres(databaseUrl(server, name), { max: 2 });
  opened.push(db);
  await sql`drop schema if exists public cascade`.execute(db);
  await sql`create schema public`.execute(db);
  return db;
}

/**
 * Closes the PostgreSQL pools the helpers opened and drops this file's databases (the
 * PostgreSQL setup runs it after each file).
 */
export async function closeTestDatabases(): Promise<void> {
  pgTestDb = undefined;
  for (const db of opened.splice(0)) await db.destroy();
  const server = postgresServerUrl();
  if (!server || made.size === 0) return;
  const names = [...made];
  made.clear();
  // Not forced: a connection still closing would be cut off and report it. A database that stays
  // busy is left for the next run's global setup to drop.
  await onServer(server, async (client) => {
    for (const name of names) {
      for (let attempt = 1; attempt <= 10; attempt++) {
        try {
          await client.query(`drop database if exists "${name}"`);
          break;
        } catch {
          await new Promise((r) => setTimeout(r, 200));
        }
      }
    }
  });
}

let cachedHash: string | undefined;

export async function addTestUser(
  db: DB,
  role: Role,
  overrides: Partial<{ email: string; name: string; customerId: number }> = {},
): Promise<User> {
  cachedHash ??= await hashPassword(TEST_PASSWORD);
  let customerId = overrides.customerId ?? null;
  if (role === "customer" && customerId === null) customerId = (await addTestCustomer(db)).id;
  return createUser(
    db,
    {
      email: overrides.email ?? `${role}-${Math.random().toString(36).slice(2, 8)}@shop.test`,
      name: overrides.name ?? `Test ${role}`,
      passwordHash: cachedHash,
      role,
      customerId,
    },
    null,
  );
}

export async function addTestCustomer(db: DB, name = "Wren Talbot"): Promise<Customer> {
  return createCustomer(
    db,
    { name, email: `${name.split(" ")[0]!.toLowerCase()}@example.test` },
    null,
  );
}

/** One user per role, for access checks. */
export async function addOneOfEachRole(db: DB): Promise<Record<Role, User>> {
  return {
    owner: await addTestUser(db, "owner"),
    machinist: await addTestUser(db, "machinist"),
    counter: await addTestUser(db, "counter"),
    customer: await addTestUser(db, "customer"),
  };
}

export async function countRows(
  db: DB,
  table: "users" | "customers" | "jobs" | "audit_log",
): Promise<number> {
  const row = await db
    .selectFrom(table)
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}
