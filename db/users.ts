import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { ConflictError, NotFoundError } from "./errors";
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

export interface NewUser {
  email: string;
  name: string;
  passwordHash: string;
  role: Role;
  customerId?: number | null;
}

export async function createUser(
  db: Kysely<Database>,
  input: NewUser,
  actorId: number | null,
): Promise<User> {
  return db.transaction().execute(async (trx) => {
    const email = normaliseEmail(input.email);
    const taken = await trx
      .selectFrom("users")
      .select("id")
      .where("email", "=", email)
      .executeTakeFirst();
    if (taken) throw new ConflictError("email", "A user with this e-mail already exists.");
    const row = await trx
      .insertInto("users")
      .values({
        email,
        name: input.name.trim(),
        password_hash: input.passwordHash,
        role: input.role,
        customer_id: input.role === "customer" ? (input.customerId ?? null) : null,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    const user = toUser(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "user",
      entityId: user.id,
      after: user,
    });
    return user;
  });
}

export interface UserChanges {
  name?: string;
  role?: Role;
  disabled?: boolean;
  customerId?: number | null;
}

export async function updateUser(
  db: Kysely<Database>,
  id: number,
  changes: UserChanges,
  actorId: number | null,
): Promise<User> {
  return db.transaction().execute(async (trx) => {
    const before = await trx
      .selectFrom("users")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirst();
    if (!before) throw new NotFoundError("user");
    const role = changes.role ?? before.role;
    const customerId = role === "customer" ? (changes.customerId ?? before.customer_id) : null;
    const row = await trx
      .updateTable("users")
      .set({
        name: changes.name?.trim() ?? before.name,
        role,
        customer_id: customerId,
        disabled: changes.disabled === undefined ? before.disabled : changes.disabled ? 1 : 0,
        // A role change or a disable ends every session issued before it.
        session_version:
          role !== before.role ||
          (changes.disabled !== undefined && changes.disabled !== (before.disabled === 1))
            ? Number(before.session_version) + 1
            : before.session_version,
      })
      .where("id", "=", id)
      .returningAll()
      .executeTakeFirstOrThrow();
    const after = toUser(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "user",
      entityId: id,
      before: toUser(before),
      after,
    });
    return after;
  });
}

/**
 * Sets a new password hash and ends every session issued before it (the session version goes
 * up by one). Answers the new session version, or undefined when there is no such user.
 */
export async function updateUserPassword(
  db: Kysely<Database>,
  id: number,
  passwordHash: string,
  actorId: number | null = null,
): Promise<number | undefined> {
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .updateTable("users")
      .set((eb) => ({
        password_hash: passwordHash,
        session_version: eb("session_version", "+", 1),
      }))
      .where("id", "=", id)
      .returning("session_version")
      .executeTakeFirst();
    if (!row) return undefined;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "password_change",
      entity: "user",
      entityId: id,
    });
    return Number(row.session_version);
  });
}

/** How many active owners there are: the last one may not be demoted or disabled. */
export async function countActiveOwners(db: Kysely<Database>): Promise<number> {
  const row = await db
    .selectFrom("users")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .where("role", "=", "owner")
    .where("disabled", "=", 0)
    .executeTakeFirstOrThrow();
  return Number(row.n);
}
