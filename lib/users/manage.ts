import type { DB } from "@/db/client";
import { findCustomerById } from "@/db/customers";
import { countActiveOwners, createUser, findUserById, updateUser, type User } from "@/db/users";
import { hashPassword } from "@/lib/auth/password";
import { HttpError } from "@/lib/http/errors";
import type { NewUserInput, UserChangesInput } from "@/lib/validation/users";

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

/** The owner changes a role or disables a user; the shop always keeps one active owner. */
export async function changeUser(
  db: DB,
  id: number,
  changes: UserChangesInput,
  actor: User,
): Promise<User> {
  const target = await findUserById(db, id);
  if (!target) throw new HttpError(404, "not_found", "No such user.");
  await checkCustomer(db, changes.customerId);
  if (
    changes.role === "customer" &&
    changes.customerId === undefined &&
    target.customerId === null
  ) {
    throw new HttpError(422, "invalid_input", "A customer account must belong to a customer.", {
      customerId: "A customer account must belong to a customer.",
    });
  }
  const losesOwner =
    target.role === "owner" &&
    !target.disabled &&
    ((changes.role && changes.role !== "owner") || changes.disabled === true);
  if (losesOwner && (await countActiveOwners(db)) <= 1) {
    throw new HttpError(409, "last_owner", "The shop needs at least one active owner.", {
      [changes.disabled ? "disabled" : "role"]: "The shop needs at least one active owner.",
    });
  }
  if (id === actor.id && changes.disabled) {
    throw new HttpError(409, "self_disable", "You cannot disable your own account.", {
      disabled: "You cannot disable your own account.",
    });
  }
  return updateUser(db, id, changes, actor.id);
}
