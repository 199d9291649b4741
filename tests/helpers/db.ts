import { inject } from "vitest";
import pg from "pg";
import { sql } from "kysely";
import { type DB, openDatabase, openPostgres, setDb } from "@/db/client";
import { createCustomer, type Customer } from "@/db/customers";
import { migrateToLatest } from "@/db/migrate";
import type { Role } from "@/db/schema";
import { createUser, type User } from "@/db/users";
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

/** The tables of a migrated database, and the rows the migrations themselves put in. */
export interface PgTemplate {
  name: string;
  /** Every table the migrations made (not Kysely's own), emptied between tests. */
  tables: string[];
  /** Rows as JSON, put back after each emptying; `identity` when its `id` is numbered. */
  seeds: { table: string; rows: string; identity: boolean }[];
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

// Each vitest worker has its own databases on the server (workers run test files side by side).
const worker = process.env.VITEST_POOL_ID ?? "1";
const opened: DB[] = [];
let pgTestDb: DB | undefined;

async function pgTestDatabase(server: string, template: PgTemplate): Promise<DB> {
  if (pgTestDb) return pgTestDb;
  const name = `counterpoise_test_${worker}`;
  // A copy of the template, migrated once by the global setup.
  await ensureDatabase(server, name, template.name);
  // Several connections, so concurrent requests in a test really run side by side.
  const db = openPostgres(databaseUrl(server, name), { max: 8 });
  opened.push(db);
  await migrateToLatest(db); // nothing to do: the copy is at the latest migration
  pgTestDb = db;
  return db;
}

/** Empties every table and puts back what the migrations wrote; ids start again from 1. */
async function emptyTables(db: DB, template: PgTemplate) {
  if (template.tables.length === 0) return;
  const tables = sql.join(template.tables.map((t) => sql.table(t)));
  await sql`truncate table ${tables} restart identity cascade`.execute(db);
  for (const seed of template.seeds) {
    await sql`
      insert into ${sql.table(seed.table)}
      select * from json_populate_recordset(null::${sql.table(seed.table)}, ${seed.rows}::json)
    `.execute(db);
    if (seed.identity) {
      await sql`
        select setval(pg_get_serial_sequence(${seed.table}, 'id'),
          (select max(id) from ${sql.table(seed.table)}))
      `.execute(db);
    }
  }
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
  const db = await pgTestDatabase(server, template);
  await emptyTables(db, template);
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

/** Closes the PostgreSQL pools the helpers opened (the PostgreSQL setup runs it after each file). */
export async function closeTestDatabases(): Promise<void> {
  pgTestDb = undefined;
  for (const db of opened.splice(0)) await db.destroy();
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
