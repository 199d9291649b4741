import type { Insertable, Kysely, Transaction, Updateable } from "kysely";
import type { InvoiceTable, QuoteLineRow, QuoteLineTable, QuoteTable } from "./billing-schema";
import { lockRow } from "./dialect";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database } from "./schema";

// Quotes and invoices are the same shape: a header row with totals and a version, and numbered
// lines in a table of their own. This module stores both; db/quotes.ts and db/invoices.ts add
// what is their own.

export type Db = Kysely<Database> | Transaction<Database>;

/** The two documents that carry priced lines. */
export type DocumentKind = "quote" | "invoice";

const TABLES = {
  quote: { header: "quotes", lines: "quote_lines", owner: "quote_id" },
  invoice: { header: "invoices", lines: "invoice_lines", owner: "invoice_id" },
} as const;

// The two line tables have the same columns but the owner's; the queries below are written once
// against the quote tables' types and run against the kind's own tables.
function linesOf(kind: DocumentKind) {
  const t = TABLES[kind];
  return { table: t.lines as "quote_lines", owner: t.owner as "quote_id" };
}

function headerOf(kind: DocumentKind) {
  return TABLES[kind].header as "quotes";
}

/** One line of a quote or an invoice. Decimal strings throughout. */
export interface DocumentLine {
  id: number;
  position: number;
  priceItemId: number | null;
  code: string | null;
  description: string;
  quantity: string;
  unitPrice: string;
  lineTotal: string;
}

/** A line to store: its place on the document, what it is and its priced total. */
export type DocumentLineValues = Omit<DocumentLine, "id">;

export function toDocumentLine(row: Omit<QuoteLineRow, "quote_id">): DocumentLine {
  return {
    id: row.id,
    position: row.position,
    priceItemId: row.price_item_id,
    code: row.code,
    description: row.description,
    quantity: row.quantity,
    unitPrice: row.unit_price,
    lineTotal: row.line_total,
  };
}

/** A document's lines in their order on the page. */
export async function listDocumentLines(
  db: Db,
  kind: DocumentKind,
  documentId: number,
): Promise<DocumentLine[]> {
  const { table, owner } = linesOf(kind);
  const rows = await db
    .selectFrom(table)
    .selectAll()
    .where(owner, "=", documentId)
    .orderBy("position")
    .execute();
  return rows.map(toDocumentLine);
}

/**
 * Stores a document's lines as given, in place of the ones it had: lines added, changed, removed
 * and put in a new order all come down to this one write.
 */
export async function replaceDocumentLines(
  db: Db,
  kind: DocumentKind,
  documentId: number,
  lines: readonly DocumentLineValues[],
): Promise<void> {
  const { table, owner } = linesOf(kind);
  await db.deleteFrom(table).where(owner, "=", documentId).execute();
  if (lines.length === 0) return;
  await db
    .insertInto(table)
    .values(
      lines.map(
        (l) =>
          ({
            position: l.position,
            price_item_id: l.priceItemId,
            code: l.code,
            description: l.description,
            quantity: l.quantity,
            unit_price: l.unitPrice,
            line_total: l.lineTotal,
            [owner]: documentId,
          }) as Insertable<QuoteLineTable>,
      ),
    )
    .execute();
}

/** A new document's header, by kind. */
export interface NewDocument {
  quote: Insertable<QuoteTable>;
  invoice: Insertable<InvoiceTable>;
}

/** Stores a new document's header and answers its id; its lines go in with replaceDocumentLines. */
export async function insertDocument<K extends DocumentKind>(
  db: Db,
  kind: K,
  values: NewDocument[K],
): Promise<number> {
  const row = await db
    .insertInto(headerOf(kind))
    .values(values as NewDocument["quote"])
    .returning("id")
    .executeTakeFirstOrThrow();
  return row.id;
}

/** What a header write may change, by kind. */
export interface DocumentChanges {
  quote: Omit<Updateable<QuoteTable>, "id" | "version">;
  invoice: Omit<Updateable<InvoiceTable>, "id" | "version">;
}

/**
 * Writes a document's header if it is still at `version`, and moves it to the next version.
 * @throws NotFoundError when there is no such document
 * @throws StaleWriteError when someone else wrote it since `version` was read
 */
export async function updateDocument<K extends DocumentKind>(
  db: Db,
  kind: K,
  id: number,
  version: number,
  changes: DocumentChanges[K],
): Promise<void> {
  const header = headerOf(kind);
  const result = await db
    .updateTable(header)
    .set({ ...(changes as DocumentChanges["quote"]), version: version + 1 })
    .where("id", "=", id)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numUpdatedRows) > 0) return;
  const now = await db.selectFrom(header).select("version").where("id", "=", id).executeTakeFirst();
  if (!now) throw new NotFoundError(kind);
  throw new StaleWriteError(kind, now.version);
}

/** Takes the document's row lock for the rest of the transaction (see lockRow). */
export async function lockDocument(db: Db, kind: DocumentKind, id: number): Promise<void> {
  await lockRow(db, headerOf(kind), id);
}
