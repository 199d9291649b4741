import {
  type Db,
  type DocumentKind,
  type DocumentLine,
  type DocumentLineValues,
  replaceDocumentLines,
} from "@/db/document-lines";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { findPriceItemsByIds } from "@/db/prices";
import { BillingInputError } from "./errors";
import { parseDecimal } from "./money";
import { computeTotals, type DocumentTotals } from "./totals";

// The rules quotes and invoices share for their lines: where a line's price comes from, and the
// totals the stored lines add up to.

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

type KeptLine = Pick<DocumentLine, "id" | "priceItemId" | "code" | "description" | "unitPrice">;

/**
 * Prices the lines a caller sent. New lines take the current price of an active price-list
 * entry; lines that name one of `kept` keep their stored price. Field errors are keyed
 * `lines.<n>.<field>`.
 */
export async function priceLines(
  db: Db,
  inputs: readonly LineInput[],
  kept: readonly KeptLine[] = [],
): Promise<PricedLineValues[]> {
  const ids = [
    ...new Set(inputs.flatMap((l) => (l.priceItemId === undefined ? [] : [l.priceItemId]))),
  ];
  const items = await findPriceItemsByIds(db, ids);
  const keptById = new Map(kept.map((l) => [l.id, l] as const));
  return inputs.map((input, i) => {
    const description = input.description?.trim() || null;
    const quantity = parseDecimal(input.quantity, "quantity").toFixed();
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
      quantity,
      unitPrice: item.unitPrice,
    };
  });
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
export async function repriceDocumentLines(
  trx: Db,
  kind: DocumentKind,
  document: { id: number; lines: readonly DocumentLine[] },
  inputs: readonly LineInput[],
  taxRate: string,
): Promise<DocumentTotals> {
  const stored = linesWithTotals(await priceLines(trx, inputs, document.lines), taxRate);
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
