import { PRICE_KINDS, type PriceItemRow, type PriceKind, type PriceUnit } from "./billing-schema";
import { lockRow } from "./dialect";
import type { Db } from "./document-lines";
import { NotFoundError, StaleWriteError } from "./errors";

/** One entry of the shop's price list. `unitPrice` is a decimal string. */
export interface PriceItem {
  id: number;
  code: string;
  description: string;
  kind: PriceKind;
  unitPrice: string;
  /** "per-cylinder": a new line starts at the job's cylinder count; "each": at 1. */
  unit: PriceUnit;
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
    unit: row.unit,
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
  unit?: PriceUnit;
  active?: boolean;
}

/** The entry using this code, other than `exceptId`, if there is one. */
export async function findPriceItemByCode(
  db: Db,
  code: string,
  exceptId?: number,
): Promise<PriceItem | undefined> {
  let q = db.selectFrom("price_items").selectAll().where("code", "=", code);
  if (exceptId !== undefined) q = q.where("id", "!=", exceptId);
  const row = await q.executeTakeFirst();
  return row && toPriceItem(row);
}

export async function insertPriceItem(db: Db, input: PriceItemInput): Promise<PriceItem> {
  const row = await db
    .insertInto("price_items")
    .values({
      code: input.code,
      description: input.description,
      kind: input.kind,
      unit_price: input.unitPrice,
      unit: input.unit ?? "each",
      active: input.active === false ? 0 : 1,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toPriceItem(row);
}

/** The entry with its row locked for the rest of the transaction (see lockRow). */
export async function lockPriceItem(db: Db, id: number): Promise<PriceItem | undefined> {
  await lockRow(db, "price_items", id);
  return findPriceItemById(db, id);
}

/**
 * Writes the changes if the entry is still at `version` (and moves it on one).
 * @throws StaleWriteError when it is not; NotFoundError when there is no such entry
 */
export async function updatePriceItemRow(
  db: Db,
  id: number,
  version: number,
  changes: Partial<PriceItemInput>,
  now: Date,
): Promise<PriceItem> {
  const row = await db
    .updateTable("price_items")
    .set({
      code: changes.code,
      description: changes.description,
      kind: changes.kind,
      unit_price: changes.unitPrice,
      unit: changes.unit,
      active: changes.active === undefined ? undefined : changes.active ? 1 : 0,
      version: version + 1,
      updated_at: now.toISOString(),
    })
    .where("id", "=", id)
    .where("version", "=", version)
    .returningAll()
    .executeTakeFirst();
  if (row) return toPriceItem(row);
  const stored = await findPriceItemById(db, id);
  if (!stored) throw new NotFoundError("price");
  throw new StaleWriteError("price", stored.version);
}

export async function findPriceItemById(db: Db, id: number): Promise<PriceItem | undefined> {
  const row = await db
    .selectFrom("price_items")
    .selectAll()
    .where("id", "=", id)
    .executeTakeFirst();
  return row && toPriceItem(row);
}

/** The price list in the order of PRICE_KINDS, then by code; `activeOnly` for what can go on a new line. */
export async function listPriceItems(
  db: Db,
  query: { activeOnly?: boolean } = {},
): Promise<PriceItem[]> {
  let q = db.selectFrom("price_items").selectAll();
  if (query.activeOnly) q = q.where("active", "=", 1);
  const rows = await q.orderBy("code").execute();
  const rank = (kind: PriceKind) => PRICE_KINDS.indexOf(kind);
  return rows.map(toPriceItem).sort((a, b) => rank(a.kind) - rank(b.kind));
}

export async function countPriceItems(db: Db): Promise<number> {
  const row = await db
    .selectFrom("price_items")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

/** The entries with these ids (any state), by id. */
export async function findPriceItemsByIds(
  db: Db,
  ids: readonly number[],
): Promise<Map<number, PriceItem>> {
  if (ids.length === 0) return new Map();
  const rows = await db.selectFrom("price_items").selectAll().where("id", "in", ids).execute();
  return new Map(rows.map((r) => [r.id, toPriceItem(r)] as const));
}
