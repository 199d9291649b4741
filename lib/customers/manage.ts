import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import {
  type Customer,
  type CustomerInput,
  insertCustomer,
  lockCustomer,
  updateCustomerRow,
} from "@/db/customers";
import { NotFoundError } from "@/db/errors";

/**
 * Adds a customer (the counter, the owner, a script) and its history entry, in one transaction.
 * Booking a job in for a new customer calls insertCustomer inside the booking's own transaction.
 */
export async function createCustomer(
  db: DB,
  input: CustomerInput,
  actorId: number | null,
): Promise<Customer> {
  return db.transaction().execute((trx) => insertCustomer(trx, input, actorId));
}

/**
 * Replaces a customer's details and records the change (before and after) in their history, in
 * one transaction; the row is locked first, so two saves at once are written one after the other.
 *
 * @throws NotFoundError when there is no such customer (or it was merged away).
 */
export async function updateCustomer(
  db: DB,
  id: number,
  input: CustomerInput,
  actorId: number | null,
): Promise<Customer> {
  return db.transaction().execute(async (trx) => {
    const before = await lockCustomer(trx, id);
    if (!before) throw new NotFoundError("customer");
    const after = await updateCustomerRow(trx, id, input);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "customer",
      entityId: id,
      before,
      after,
    });
    return after;
  });
}
