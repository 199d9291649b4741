import { type DB, openDatabase, setDb } from "@/db/client";
import { createCustomer, type Customer } from "@/db/customers";
import { migrateToLatest } from "@/db/migrate";
import type { Role } from "@/db/schema";
import { createUser, type User } from "@/db/users";
import { hashPassword } from "@/lib/auth/password";

export const TEST_PASSWORD = "correct horse battery";

/** A fresh, migrated in-memory database, installed as the app's database. */
export async function freshDb(): Promise<DB> {
  const db = openDatabase(":memory:");
  await migrateToLatest(db);
  setDb(db);
  return db;
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
