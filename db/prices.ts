import type { Kysely } from "kysely";
import { BillingInputError } from "@/lib/billing/errors";
import { parseDecimal } from "@/lib/billing/money";
import { createAuditEntry } from "./audit";
import { PRICE_KINDS, type PriceItemRow, type PriceKind } from "./billing-schema";
import { lockRow } from "./dialect";
import { ConflictError, NotFoundError, StaleWriteError } from "./errors";
import type { Database } from "./schema";

/** One entry of the shop's price list. `unitPrice` is a decimal string. */
export interface PriceItem {
  id: number;
  code: string;
  description: string;
  kind: PriceKind;
  unitPrice: string;
  active: boolean;
  version: number;
  updatedAt: string;
}

export function toPriceItem(row: PriceItemRow): PriceItem {
  return {
    id: row.id,
    code: row.code,
    description: row.description,
    kind: row.kind,
    unitPrice: row.unit_price,
    active: row.active === 1,
    version: row.version,
    updatedAt: row.updated_at,
  };
}

export interface PriceItemInput {
  code: string;
  description: string;
  kind: PriceKind;
  unitPrice: string;
  active?: boolean;
}

async function assertCodeFree(db: Kysely<Database>, code: string, exceptId?: number) {
  let q = db.selectFrom("price_items").select("id").where("code", "=", code);
  if (exceptId !== undefined) q = q.where("id", "!=", exceptId);
  if (await q.executeTakeFirst()) {
    throw new ConflictError("code", `Another price already uses the code ${code}.`);
  }
}

export async function createPriceItem(
  db: Kysely<Database>,
  input: PriceItemInput,
  actorId: number | null,
): Promise<PriceItem> {
  return db.transaction().execute(async (trx) => {
    await assertCodeFree(trx, input.code);
    const row = await trx
      .insertInto("price_items")
      .values({
        code: input.code,
        description: input.description,
        kind: input.kind,
        unit_price: input.unitPrice,
        active: input.active === false ? 0 : 1,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    const item = toPriceItem(row);
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
  db: Kysely<Database>,
  id: number,
  baseVersion: number,
  changes: Partial<PriceItemInput>,
  actorId: number | null,
  now = new Date(),
): Promise<PriceItem> {
  return db.transaction().execute(async (trx) => {
    await lockRow(trx, "price_items", id);
    const row = await trx
      .selectFrom("price_items")
      .selectAll()
      .where("id", "=", id)
      .executeTakeFirst();
    if (!row) throw new NotFoundError("price");
    if (row.version !== baseVersion) throw new StaleWriteError("price", row.version);
    if (changes.code !== undefined) await assertCodeFree(trx, changes.code, id);
    const updated = await trx
      .updateTable("price_items")
      .set({
        code: changes.code,
        description: changes.description,
        kind: changes.kind,
        unit_price: changes.unitPrice,
        active: changes.active === undefined ? undefined : changes.active ? 1 : 0,
        version: row.version + 1,
        updated_at: now.toISOString(),
      })
      .where("id", "=", id)
      .returningAll()
      .executeTakeFirstOrThrow();
    const after = toPriceItem(updated);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "price_item",
      entityId: id,
      before: toPriceItem(row),
      after,
    });
    return after;
  });
}

export async function findPriceItemById(
  db: Kysely<Database>,
  id: number,
): Promise<PriceItem | undefined> {
  const row = await db
    .selectFrom("price_items")
    .selectAll()
    .where("id", "=", id)
    .executeTakeFirst();
  return row && toPriceItem(row);
}

/** The price list in the order of PRICE_KINDS, then by code; `activeOnly` for what can go on a new line. */
export async function listPriceItems(
  db: Kysely<Database>,
  query: { activeOnly?: boolean } = {},
): Promise<PriceItem[]> {
  let q = db.selectFrom("price_items").selectAll();
  if (query.activeOnly) q = q.where("active", "=", 1);
  const rows = await q.orderBy("code").execute();
  const rank = (kind: PriceKind) => PRICE_KINDS.indexOf(kind);
  return rows.map(toPriceItem).sort((a, b) => rank(a.kind) - rank(b.kind));
}

export async function countPriceItems(db: Kysely<Database>): Promise<number> {
  const row = await db
    .selectFrom("price_items")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

/** What a caller sends for one line: a new line from the price list, or an existing line kept
 * at the price it was made with (its quantity and description may change). */
export type LineInput =
  | { priceItemId: number; lineId?: undefined; quantity: string; description?: string | null }
  | { lineId: number; priceItemId?: undefined; quantity: string; description?: string | null };

/** A line ready to store: the price comes from the list (or the kept line), never the caller. */
export interface PricedLineValues {
  priceItemId: number | null;
  code: string | null;
  description: string;
  quantity: string;
  unitPrice: string;
}

interface KeptLine {
  id: number;
  priceItemId: number | null;
  code: string | null;
  description: string;
  unitPrice: string;
}

/**
 * Prices the lines a caller sent. New lines take the current price of an active price-list
 * entry; lines that name one of `kept` keep their stored price. Field errors are keyed
 * `lines.<n>.<field>`.
 */
export async function priceLines(
  db: Kysely<Database>,
  inputs: readonly LineInput[],
  kept: readonly KeptLine[] = [],
): Promise<PricedLineValues[]> {
  const ids = [
    ...new Set(inputs.flatMap((l) => (l.priceItemId === undefined ? [] : [l.priceItemId]))),
  ];
  const items = new Map(
    ids.length === 0
      ? []
      : (await db.selectFrom("price_items").selectAll().where("id", "in", ids).execute()).map(
          (r) => [r.id, r] as const,
        ),
  );
  const keptById = new Map(kept.map((l) => [l.id, l] as const));
  return inputs.map((input, i) => {
    const description = input.description?.trim() || null;
    const quantity = normaliseQuantity(input.quantity);
    if (input.lineId !== undefined) {
      const line = keptById.get(input.lineId);
      if (!line)
        throw new BillingInputError(`lines.${i}.lineId`, "That line is not on this document.");
      return {
        priceItemId: line.priceItemId,
        code: line.code,
        description: description ?? line.description,
        quantity,
        unitPrice: line.unitPrice,
      };
    }
    const item = items.get(input.priceItemId);
    if (!item || item.active !== 1) {
      throw new BillingInputError(
        `lines.${i}.priceItemId`,
        "Choose an active entry of the price list.",
      );
    }
    return {
      priceItemId: item.id,
      code: item.code,
      description: description ?? item.description,
      quantity,
      unitPrice: item.unit_price,
    };
  });
}

function normaliseQuantity(text: string): string {
  return parseDecimal(text, "quantity").toFixed();
}
