import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Db } from "@/db/document-lines";
import { ConflictError, NotFoundError, StaleWriteError } from "@/db/errors";
import {
  findPriceItemByCode,
  insertPriceItem,
  lockPriceItem,
  type PriceItem,
  type PriceItemInput,
  updatePriceItemRow,
} from "@/db/prices";

async function assertCodeFree(trx: Db, code: string, exceptId?: number) {
  if (await findPriceItemByCode(trx, code, exceptId)) {
    throw new ConflictError("code", `Another price already uses the code ${code}.`);
  }
}

/** Adds an entry to the price list; each code names one entry. */
export async function createPriceItem(
  db: DB,
  input: PriceItemInput,
  actorId: number | null,
): Promise<PriceItem> {
  return db.transaction().execute(async (trx) => {
    await assertCodeFree(trx, input.code);
    const item = await insertPriceItem(trx, input);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "price_item",
      entityId: item.id,
      after: item,
    });
    return item;
  });
}

/** Changes a price if the stored version is the one the caller read. Lines already quoted or
 * invoiced keep the price they were made with. */
export async function updatePriceItem(
  db: DB,
  id: number,
  baseVersion: number,
  changes: Partial<PriceItemInput>,
  actorId: number | null,
  now = new Date(),
): Promise<PriceItem> {
  return db.transaction().execute(async (trx) => {
    const before = await lockPriceItem(trx, id);
    if (!before) throw new NotFoundError("price");
    if (before.version !== baseVersion) throw new StaleWriteError("price", before.version);
    if (changes.code !== undefined) await assertCodeFree(trx, changes.code, id);
    const after = await updatePriceItemRow(trx, id, before.version, changes, now);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "price_item",
      entityId: id,
      before,
      after,
    });
    return after;
  });
}
