import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import {
  type Customer,
  countCustomerHoldings,
  type CustomerHoldings,
  deleteCustomerRow,
  lockCustomer,
  moveCustomerHoldings,
} from "@/db/customers";
import { ConflictError, NotFoundError } from "@/db/errors";

export interface MergeResult {
  kept: Customer;
  removed: Customer;
  moved: { jobs: number; quotes: number; invoices: number; accounts: number; invites: number };
}

/**
 * Folds one customer into another (a customer entered twice at the counter): the removed
 * customer's jobs (with their quotes and invoices), customer accounts and invites move to the
 * kept customer, then the removed customer is deleted. A customer with an account on both sides
 * keeps both accounts, both now pointing at the kept customer. One transaction; the merge is
 * written to both customers' history.
 *
 * @throws NotFoundError when either customer does not exist (or was merged away meanwhile).
 * @throws ConflictError when both ids are the same customer.
 */
export async function mergeCustomers(
  db: DB,
  keepId: number,
  removeId: number,
  actorId: number | null,
): Promise<MergeResult> {
  if (keepId === removeId) {
    throw new ConflictError("removeId", "A customer cannot be merged into itself; choose another.");
  }
  return db.transaction().execute(async (trx) => {
    // Lock in id order so two merges of the same pair cannot deadlock on PostgreSQL.
    const [first, second] = keepId < removeId ? [keepId, removeId] : [removeId, keepId];
    const a = await lockCustomer(trx, first);
    const b = await lockCustomer(trx, second);
    const kept = keepId === first ? a : b;
    const removed = keepId === first ? b : a;
    if (!kept || !removed) throw new NotFoundError("customer");
    const holdings: CustomerHoldings = await countCustomerHoldings(trx, removed.id);
    const moved = await moveCustomerHoldings(trx, removed.id, kept.id);
    await deleteCustomerRow(trx, removed.id);
    const summary = { ...holdings, ...moved };
    await createAuditEntry(trx, {
      userId: actorId,
      action: "merge",
      entity: "customer",
      entityId: kept.id,
      before: removed,
      after: { keptId: kept.id, removedId: removed.id, moved: summary },
    });
    await createAuditEntry(trx, {
      userId: actorId,
      action: "merged_away",
      entity: "customer",
      entityId: removed.id,
      before: removed,
      after: { keptId: kept.id, keptName: kept.name },
    });
    return { kept, removed, moved: summary };
  });
}
