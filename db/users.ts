import type { Kysely } from "kysely";
import { forUpdate } from "./dialect";
import type { Database, Role, UserRow } from "./schema";

/** A user as the app sees one: never carries the password hash. */
export interface User {
  id: number;
  email: string;
  name: string;
  role: Role;
  disabled: boolean;
  customerId: number | null;
  createdAt: string;
}

export function toUser(row: UserRow): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    disabled: row.disabled === 1,
    customerId: row.customer_id,
    createdAt: row.created_at,
  };
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function findUserByEmail(
  db: Kysely<Database>,
  email: string,
): Promise<UserRow | undefined> {
  return db
    .selectFrom("users")
    .selectAll()
    .where("email", "=", normaliseEmail(email))
    .executeTakeFirst();
}

export async function findUserById(db: Kysely<Database>, id: number): Promise<User | undefined> {
  const row = await db.selectFrom("users").selectAll().where("id", "=", id).executeTakeFirst();
  return row && toUser(row);
}

/** The user a session cookie names, with the session version its cookie must carry. */
export async function findUserForSession(
  db: Kysely<Database>,
  id: number,
): Promise<{ user: User; sessionVersion: number } | undefined> {
  const row = await db.selectFrom("users").selectAll().where("id", "=", id).executeTakeFirst();
  return row && { user: toUser(row), sessionVersion: Number(row.session_version) };
}

/** The session version a user's cookies are issued at now. */
export async function findSessionVersion(
  db: Kysely<Database>,
  id: number,
): Promise<number | undefined> {
  const row = await db
    .selectFrom("users")
    .select("session_version")
    .where("id", "=", id)
    .executeTakeFirst();
  return row && Number(row.session_version);
}

export async function listUsers(db: Kysely<Database>): Promise<User[]> {
  const rows = await db.selectFrom("users").selectAll().orderBy("role").orderBy("name").execute();
  return rows.map(toUser);
}

/** The columns of a new user, as the service shaped them (e-mail normalised, name trimmed). */
export interface UserInsert {
  email: string;
  name: string;
  passwordHash: string;
  role: Role;
  customerId: number | null;
}

/** Inserts a user row; the caller checks the e-mail is free and writes the audit entry. */
export async function insertUser(db: Kysely<Database>, input: UserInsert): Promise<User> {
  const row = await db
    .insertInto("users")
    .values({
      email: input.email,
      name: input.name,
      password_hash: input.passwordHash,
      role: input.role,
      customer_id: input.customerId,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toUser(row);
}

/** The user row, locked for the rest of the caller's transaction on PostgreSQL. */
export async function lockUserRow(trx: Kysely<Database>, id: number): Promise<UserRow | undefined> {
  return trx
    .selectFrom("users")
    .selectAll()
    .where("id", "=", id)
    .$call(forUpdate(trx))
    .executeTakeFirst();
}

/**
 * The ids of the active owners, each row locked for the rest of the caller's transaction on
 * PostgreSQL (in id order, so two writers queue up rather than deadlock). A writer that waited
 * reads the rows as the first one left them: an owner demoted or disabled meanwhile drops out.
 */
export async function lockActiveOwnerIds(trx: Kysely<Database>): Promise<number[]> {
  const rows = await trx
    .selectFrom("users")
    .select("id")
    .where("role", "=", "owner")
    .where("disabled", "=", 0)
    .orderBy("id")
    .$call(forUpdate(trx))
    .execute();
  return rows.map((r) => r.id);
}

/** The columns a change of a user writes. */
export interface UserUpdate {
  name: string;
  role: Role;
  customerId: number | null;
  disabled: boolean;
  sessionVersion: number;
}

/** Writes a user's changed columns and answers the user as stored. */
export async function updateUserRow(
  db: Kysely<Database>,
  id: number,
  changes: UserUpdate,
): Promise<User> {
  const row = await db
    .updateTable("users")
    .set({
      name: changes.name,
      role: changes.role,
      customer_id: changes.customerId,
      disabled: changes.disabled ? 1 : 0,
      session_version: changes.sessionVersion,
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirstOrThrow();
  return toUser(row);
}

/**
 * Stores a new password hash and adds one to the session version in the same statement.
 * Answers the new session version, or undefined when there is no such user.
 */
export async function setUserPasswordHash(
  db: Kysely<Database>,
  id: number,
  passwordHash: string,
): Promise<number | undefined> {
  const row = await db
    .updateTable("users")
    .set((eb) => ({
      password_hash: passwordHash,
      session_version: eb("session_version", "+", 1),
    }))
    .where("id", "=", id)
    .returning("session_version")
    .executeTakeFirst();
  return row && Number(row.session_version);
}
