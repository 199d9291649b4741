import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { findCustomerById } from "@/db/customers";
import { ConflictError, NotFoundError } from "@/db/errors";
import type { Role, UserRow } from "@/db/schema";
import {
  findUserByEmail,
  insertUser,
  lockActiveOwnerIds,
  lockUserRow,
  normaliseEmail,
  setUserPasswordHash,
  toUser,
  updateUserRow,
  type User,
} from "@/db/users";
import { hashPassword } from "@/lib/auth/password";
import { isCustomer, isOwner } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";
import type { NewUserInput, UserChangesInput } from "@/lib/validation/users";

export interface NewUser {
  email: string;
  name: string;
  passwordHash: string;
  role: Role;
  customerId?: number | null;
}

export interface UserChanges {
  name?: string;
  role?: Role;
  disabled?: boolean;
  customerId?: number | null;
}

/**
 * Makes a user (the e-mail lower-cased and trimmed, the name trimmed; a customer id only on a
 * customer account) and its audit entry, in one transaction.
 *
 * @throws ConflictError (409, field email) when an account already has this e-mail.
 */
export async function createUser(db: DB, input: NewUser, actorId: number | null): Promise<User> {
  return db.transaction().execute((trx) => createUserIn(trx, input, actorId));
}

/** createUser inside the caller's transaction (accepting an invite makes the account and uses it up). */
export async function createUserIn(trx: DB, input: NewUser, actorId: number | null): Promise<User> {
  const email = normaliseEmail(input.email);
  if (await findUserByEmail(trx, email)) {
    throw new ConflictError("email", "A user with this e-mail already exists.");
  }
  const user = await insertUser(trx, {
    email,
    name: input.name.trim(),
    passwordHash: input.passwordHash,
    role: input.role,
    customerId: isCustomer(input) ? (input.customerId ?? null) : null,
  });
  await createAuditEntry(trx, {
    userId: actorId,
    action: "create",
    entity: "user",
    entityId: user.id,
    after: user,
  });
  return user;
}

/** The row a change makes of `before`: a role change or a disable ends every earlier session. */
function changedColumns(before: UserRow, changes: UserChanges) {
  const role = changes.role ?? before.role;
  const wasDisabled = before.disabled === 1;
  const disabled = changes.disabled ?? wasDisabled;
  const endsSessions = role !== before.role || disabled !== wasDisabled;
  return {
    name: changes.name?.trim() ?? before.name,
    role,
    customerId: isCustomer({ role }) ? (changes.customerId ?? before.customer_id) : null,
    disabled,
    sessionVersion: Number(before.session_version) + (endsSessions ? 1 : 0),
  };
}

/** Writes the change over the locked row `before` and its audit entry (inside `trx`). */
async function writeChange(
  trx: DB,
  before: UserRow,
  changes: UserChanges,
  actorId: number | null,
): Promise<User> {
  const after = await updateUserRow(trx, before.id, changedColumns(before, changes));
  await createAuditEntry(trx, {
    userId: actorId,
    action: "update",
    entity: "user",
    entityId: before.id,
    before: toUser(before),
    after,
  });
  return after;
}

/**
 * Changes a user's name, role, customer or disabled mark, with no rule but the data's own (used
 * by tests and scripts; the owner's screen goes through changeUser). A role change or a
 * disable adds one to the session version, so every session issued before it ends.
 *
 * @throws NotFoundError when there is no such user.
 */
export async function updateUser(
  db: DB,
  id: number,
  changes: UserChanges,
  actorId: number | null,
): Promise<User> {
  return db.transaction().execute(async (trx) => {
    const before = await lockUserRow(trx, id);
    if (!before) throw new NotFoundError("user");
    return writeChange(trx, before, changes, actorId);
  });
}

/**
 * Sets a new password hash and ends every session issued before it (the session version goes
 * up by one), with an audit entry. Answers the new session version, or undefined when there is
 * no such user.
 */
export async function updateUserPassword(
  db: DB,
  id: number,
  passwordHash: string,
  actorId: number | null = null,
): Promise<number | undefined> {
  return db.transaction().execute(async (trx) => {
    const version = await setUserPasswordHash(trx, id, passwordHash);
    if (version === undefined) return undefined;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "password_change",
      entity: "user",
      entityId: id,
    });
    return version;
  });
}

async function checkCustomer(db: DB, customerId: number | undefined) {
  if (customerId !== undefined && !(await findCustomerById(db, customerId))) {
    throw new HttpError(422, "invalid_input", "No such customer.", {
      customerId: "No such customer.",
    });
  }
}

/** The owner adds a user; passwords are stored only as bcrypt hashes. */
export async function addUser(db: DB, input: NewUserInput, actor: User): Promise<User> {
  await checkCustomer(db, input.customerId);
  return createUser(db, { ...input, passwordHash: await hashPassword(input.password) }, actor.id);
}

const LAST_OWNER = "The shop needs at least one active owner.";

/**
 * The owner changes a role or disables a user; the shop always keeps one active owner. One
 * transaction: a change that could take an owner away first locks every active owner's row
 * (then the user's), so two such changes made at once take turns and the second one counts the
 * owners the first one left.
 *
 * @throws HttpError 404 no such user; 422 no such customer, or a customer account without one;
 *   409 `last_owner` when it would leave no active owner; 409 `self_disable`.
 */
export async function changeUser(
  db: DB,
  id: number,
  changes: UserChangesInput,
  actor: User,
): Promise<User> {
  return db.transaction().execute(async (trx) => {
    const mayLoseOwner = (changes.role && !isOwner(changes)) || changes.disabled === true;
    const owners = mayLoseOwner ? await lockActiveOwnerIds(trx) : [];
    const before = await lockUserRow(trx, id);
    if (!before) throw new HttpError(404, "not_found", "No such user.");
    await checkCustomer(trx, changes.customerId);
    if (isCustomer(changes) && changes.customerId === undefined && before.customer_id === null) {
      throw new HttpError(422, "invalid_input", "A customer account must belong to a customer.", {
        customerId: "A customer account must belong to a customer.",
      });
    }
    const losesOwner = mayLoseOwner && isOwner(before) && before.disabled === 0;
    if (losesOwner && owners.length <= 1) {
      throw new HttpError(409, "last_owner", LAST_OWNER, {
        [changes.disabled ? "disabled" : "role"]: LAST_OWNER,
      });
    }
    if (id === actor.id && changes.disabled) {
      throw new HttpError(409, "self_disable", "You cannot disable your own account.", {
        disabled: "You cannot disable your own account.",
      });
    }
    return writeChange(trx, before, changes, actor.id);
  });
}
