import { createAuditEntry } from "@/db/audit";
import {
  type Db,
  type DocumentChanges,
  type DocumentKind,
  type DocumentLine,
  type DocumentLineValues,
  insertDocument,
  lockDocument,
  type NewDocument,
  replaceDocumentLines,
  updateDocument,
} from "@/db/document-lines";
import { ConflictError, NotFoundError, StaleWriteError } from "@/db/errors";
import { findInvoiceById, type Invoice } from "@/db/invoices";
import { findJobById } from "@/db/jobs";
import { findPriceItemsByIds } from "@/db/prices";
import { findQuoteById, type Quote } from "@/db/quotes";
import { findShopSettings } from "@/db/settings";
import { BillingInputError } from "./errors";
import { parseDecimal } from "./money";
import { startingQuantity } from "./quantity";
import { computeTotals, type DocumentTotals } from "./totals";

// The rules quotes and invoices share for their lines: where a line's price comes from, and the
// totals the stored lines add up to.

/**
 * What a caller sends for one line: a new line from the price list (quantity left out: 1, or the
 * job's cylinder count for an entry charged per cylinder), an existing line kept at the price it
 * was made with (its quantity and description may change), or a one-off line the counter typed
 * (what the work is, how many, the price each; no price-list entry).
 */
export type LineInput =
  | {
      priceItemId: number;
      lineId?: undefined;
      unitPrice?: undefined;
      quantity?: string;
      description?: string | null;
    }
  | {
      lineId: number;
      priceItemId?: undefined;
      unitPrice?: undefined;
      quantity: string;
      description?: string | null;
    }
  | {
      priceItemId?: undefined;
      lineId?: undefined;
      description: string;
      quantity: string;
      unitPrice: string;
    };

/** What pricing a job's lines needs to know of the job. */
export interface LineContext {
  /** The job's cylinder count (null when not entered): where per-cylinder lines start. */
  cylinders: number | null;
}

/** A line ready to store: the price comes from the list (or the kept line), never the caller. */
export interface PricedLineValues {
  priceItemId: number | null;
  code: string | null;
  description: string;
  quantity: string;
  unitPrice: string;
}

type KeptLine = Pick<DocumentLine, "id" | "priceItemId" | "code" | "description" | "unitPrice">;

/**
 * Prices the lines a caller sent. New lines take the current price of an active price-list
 * entry (and start at the job's cylinder count when charged per cylinder and no quantity was
 * sent); lines that name one of `kept` keep their stored price; one-off lines keep the price
 * typed, as a plain decimal. Field errors are keyed `lines.<n>.<field>`.
 */
export async function priceLines(
  db: Db,
  inputs: readonly LineInput[],
  kept: readonly KeptLine[] = [],
  context: LineContext = { cylinders: null },
): Promise<PricedLineValues[]> {
  const ids = [
    ...new Set(inputs.flatMap((l) => (l.priceItemId === undefined ? [] : [l.priceItemId]))),
  ];
  const items = await findPriceItemsByIds(db, ids);
  const keptById = new Map(kept.map((l) => [l.id, l] as const));
  return inputs.map((input, i) => {
    const description = input.description?.trim() || null;
    const quantityOf = (q: string) => parseDecimal(q, `lines.${i}.quantity`).toFixed();
    if (input.unitPrice !== undefined) {
      if (!description) {
        throw new BillingInputError(`lines.${i}.description`, "Describe the work.");
      }
      const unitPrice = input.unitPrice.trim();
      parseDecimal(unitPrice, `lines.${i}.unitPrice`); // refuses anything but a plain decimal
      return {
        priceItemId: null,
        code: null,
        description,
        quantity: quantityOf(input.quantity),
        unitPrice,
      };
    }
    if (input.lineId !== undefined) {
      const quantity = quantityOf(input.quantity);
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
    if (!item || !item.active) {
      throw new BillingInputError(
        `lines.${i}.priceItemId`,
        "Choose an active entry of the price list.",
      );
    }
    return {
      priceItemId: item.id,
      code: item.code,
      description: description ?? item.description,
      quantity: quantityOf(input.quantity ?? startingQuantity(item.unit, context.cylinders)),
      unitPrice: item.unitPrice,
    };
  });
}

/** What pricing needs to know of the job a document is for. */
async function lineContextOf(db: Db, jobId: number): Promise<LineContext> {
  const job = await findJobById(db, jobId);
  return { cylinders: job?.spec.cylinders ?? null };
}

/** Priced lines numbered in order with their totals, and the document's totals at a tax rate. */
export function linesWithTotals(
  lines: readonly PricedLineValues[],
  taxRate: string,
): { lines: DocumentLineValues[]; totals: DocumentTotals } {
  const totals = computeTotals(lines, taxRate);
  return {
    lines: lines.map((l, i) => ({
      position: i + 1,
      priceItemId: l.priceItemId,
      code: l.code,
      description: l.description,
      quantity: l.quantity,
      unitPrice: l.unitPrice,
      lineTotal: totals.lineTotals[i]!,
    })),
    totals,
  };
}

/**
 * A document read under its row lock, checked against the version the caller read (when given).
 * @throws NotFoundError when there is no such document
 * @throws StaleWriteError when it has moved on since `baseVersion`
 */
export function lockedAt<T extends { version: number }>(
  document: T | undefined,
  kind: DocumentKind,
  baseVersion?: number,
): T {
  if (!document) throw new NotFoundError(kind);
  if (baseVersion !== undefined && document.version !== baseVersion) {
    throw new StaleWriteError(kind, document.version);
  }
  return document;
}

/**
 * Prices the lines sent for a document (kept lines at their stored price), stores them in the
 * order given in place of the ones it had, and answers the totals for its header. The caller
 * owns the transaction.
 */
async function repriceDocumentLines(
  trx: Db,
  kind: DocumentKind,
  document: { id: number; lines: readonly DocumentLine[] },
  inputs: readonly LineInput[],
  taxRate: string,
  context: LineContext = { cylinders: null },
): Promise<DocumentTotals> {
  const stored = linesWithTotals(await priceLines(trx, inputs, document.lines, context), taxRate);
  await replaceDocumentLines(trx, kind, document.id, stored.lines);
  return stored.totals;
}

/** The header columns a document's totals fill. */
export function totalsColumns(
  totals: DocumentTotals,
  settings: { taxRate: string; currency: string },
) {
  return {
    tax_rate: settings.taxRate,
    currency: settings.currency,
    subtotal: totals.subtotal,
    tax: totals.tax,
    total: totals.total,
  };
}

/** A document as the services read and answer it, by kind. */
export interface Documents {
  quote: Quote;
  invoice: Invoice;
}

function findDocument<K extends DocumentKind>(
  trx: Db,
  kind: K,
  id: number,
): Promise<Documents[K] | undefined> {
  const find = kind === "quote" ? findQuoteById : findInvoiceById;
  return find(trx, id) as Promise<Documents[K] | undefined>;
}

const ARTICLE: Record<DocumentKind, string> = { quote: "A quote", invoice: "An invoice" };

/** Refuses a move the document's state does not allow, in the words the counter reads. */
export function refuseInState(kind: DocumentKind, status: string, doing: string): never {
  throw new ConflictError("status", `${ARTICLE[kind]} that is ${status} cannot be ${doing}.`);
}

/** What a new document's header says of its own; totals, tax, currency and times are filled in. */
export type OwnHeader<K extends DocumentKind> = Omit<
  NewDocument[K],
  | "tax_rate"
  | "currency"
  | "subtotal"
  | "tax"
  | "total"
  | "created_by"
  | "created_at"
  | "updated_at"
>;

/**
 * Stores a new document with its priced lines, totalled at the shop's tax rate and in its
 * currency as they are now, and logs its creation. The caller owns the transaction.
 */
export async function createDocument<K extends DocumentKind>(
  trx: Db,
  kind: K,
  header: OwnHeader<K>,
  priced: readonly PricedLineValues[],
  actorId: number | null,
  now: Date,
): Promise<Documents[K]> {
  const settings = await findShopSettings(trx);
  const { lines, totals } = linesWithTotals(priced, settings.taxRate);
  const id = await insertDocument(trx, kind, {
    ...header,
    ...totalsColumns(totals, settings),
    created_by: actorId,
    created_at: now.toISOString(),
    updated_at: now.toISOString(),
  } as NewDocument[K]);
  await replaceDocumentLines(trx, kind, id, lines);
  const after = (await findDocument(trx, kind, id))!;
  await createAuditEntry(trx, {
    userId: actorId,
    action: "create",
    entity: kind,
    entityId: id,
    after,
  });
  return after;
}

/**
 * One change to a document under its row lock: read it (checked against `baseVersion` when
 * given), let `decide` refuse (by throwing) or answer the header's changes, write them at the
 * version read, and log the change. The caller owns the transaction.
 * @throws NotFoundError, StaleWriteError, and whatever `decide` refuses with
 */
export async function changeDocument<K extends DocumentKind>(
  trx: Db,
  kind: K,
  id: number,
  change: {
    action: string;
    actorId: number | null;
    baseVersion?: number;
    decide: (before: Documents[K]) => Promise<DocumentChanges[K]> | DocumentChanges[K];
    /** What the audit log keeps; the whole document before and after when not given. */
    logged?: (before: Documents[K], after: Documents[K]) => { before?: unknown; after?: unknown };
  },
): Promise<Documents[K]> {
  await lockDocument(trx, kind, id);
  const before = lockedAt(await findDocument(trx, kind, id), kind, change.baseVersion);
  await updateDocument(trx, kind, id, before.version, await change.decide(before));
  const after = (await findDocument(trx, kind, id))!;
  await createAuditEntry(trx, {
    userId: change.actorId,
    action: change.action,
    entity: kind,
    entityId: id,
    ...(change.logged ? change.logged(before, after) : { before, after }),
  });
  return after;
}

/**
 * Replaces a draft's lines at the version the caller read: new lines at today's list price and
 * the shop's tax rate and currency now, kept lines at their stored price. Only a draft changes.
 * The caller owns the transaction.
 */
export function replaceDraftLines<K extends DocumentKind>(
  trx: Db,
  kind: K,
  id: number,
  baseVersion: number,
  inputs: readonly LineInput[],
  actorId: number | null,
  now: Date,
): Promise<Documents[K]> {
  return changeDocument(trx, kind, id, {
    action: "update",
    actorId,
    baseVersion,
    decide: async (before) => {
      if (before.status !== "draft") refuseInState(kind, before.status, "changed");
      const settings = await findShopSettings(trx);
      const totals = await repriceDocumentLines(
        trx,
        kind,
        before,
        inputs,
        settings.taxRate,
        await lineContextOf(trx, before.jobId),
      );
      return { ...totalsColumns(totals, settings), updated_at: now.toISOString() };
    },
  });
}
