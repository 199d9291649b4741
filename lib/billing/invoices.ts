import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { findCustomerById } from "@/db/customers";
import { lockDocument } from "@/db/document-lines";
import { ConflictError, NotFoundError } from "@/db/errors";
import {
  deleteInvoiceRow,
  findInvoiceById,
  findLiveInvoiceForQuote,
  type Invoice,
  type Issuer,
} from "@/db/invoices";
import { findJobById } from "@/db/jobs";
import { takeNextNumber } from "./numbering";
import { findQuoteById } from "@/db/quotes";
import { findShopSettings } from "@/db/settings";
import { closeInvoicePaymentPages } from "@/lib/payments/close-pages";
import {
  changeDocument,
  createDocument,
  type LineInput,
  linesWithTotals,
  lockedAt,
  type PricedLineValues,
  priceLines,
  refuseInState,
  replaceDraftLines,
  totalsColumns,
} from "./document-lines";
import { BillingInputError } from "./errors";
import { compareMoney } from "./money";
import { tellInvoiceIssued } from "@/lib/mail/events";
import type { SendOptions } from "@/lib/mail/send";

export type NewInvoiceInput =
  | { jobId: number; quoteId: number; lines?: undefined }
  | { jobId: number; quoteId?: undefined; lines: readonly LineInput[] };

/**
 * A draft invoice for a job: a copy of its accepted quote's lines at the quoted prices, or lines
 * priced from the list. One live (not void) invoice per quote.
 */
export async function createInvoice(
  db: DB,
  input: NewInvoiceInput,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute(async (trx) => {
    const job = await findJobById(trx, input.jobId);
    if (!job) throw new NotFoundError("job");
    let priced: PricedLineValues[];
    if (input.quoteId !== undefined) {
      const quote = await findQuoteById(trx, input.quoteId);
      if (!quote || quote.jobId !== input.jobId) {
        throw new BillingInputError("quoteId", "That quote is not for this job.");
      }
      if (quote.status !== "accepted") {
        throw new ConflictError("quoteId", `Quote ${quote.number} has not been accepted.`);
      }
      if (await findLiveInvoiceForQuote(trx, quote.id)) {
        throw new ConflictError("quoteId", `Quote ${quote.number} is already invoiced.`);
      }
      priced = quote.lines;
    } else {
      priced = await priceLines(trx, input.lines, [], { cylinders: job.spec.cylinders });
    }
    return createDocument(
      trx,
      "invoice",
      { job_id: input.jobId, quote_id: input.quoteId ?? null },
      priced,
      actorId,
      now,
    );
  });
}

/** Replaces a draft invoice's lines; kept lines (by lineId) keep their price. */
export async function replaceInvoiceLines(
  db: DB,
  id: number,
  baseVersion: number,
  lines: readonly LineInput[],
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db
    .transaction()
    .execute((trx) => replaceDraftLines(trx, "invoice", id, baseVersion, lines, actorId, now));
}

function billToText(c: {
  name: string;
  company: string | null;
  address: string | null;
  email: string | null;
}): string {
  return [c.name, c.company, c.address, c.email].filter((x): x is string => !!x).join("\n");
}

/**
 * Issues a draft: draws the next invoice number, applies the shop's tax rate and currency as
 * they are at this moment, and freezes the shop's and the customer's details on the invoice.
 */
export async function issueInvoice(
  db: DB,
  id: number,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute((trx) =>
    changeDocument(trx, "invoice", id, {
      action: "issue",
      actorId,
      decide: async (before) => {
        if (before.status !== "draft") refuseInState("invoice", before.status, "issued");
        if (before.lines.length === 0)
          throw new BillingInputError("lines", "Add at least one line first.");
        const settings = await findShopSettings(trx);
        const { totals } = linesWithTotals(before.lines, settings.taxRate);
        if (compareMoney(totals.total, "0") <= 0) {
          throw new BillingInputError("lines", "An invoice must be for more than nothing.");
        }
        const customer = await findCustomerById(trx, before.customerId);
        if (!customer) throw new NotFoundError("customer");
        const issuer: Issuer = {
          shopName: settings.shopName,
          address: settings.address,
          phone: settings.phone,
          email: settings.email,
        };
        return {
          number: await takeNextNumber(trx, "invoice", now),
          status: "issued",
          ...totalsColumns(totals, settings),
          issuer_json: JSON.stringify(issuer),
          bill_to: billToText(customer),
          footer: settings.invoiceFooter,
          issued_at: now.toISOString(),
          updated_at: now.toISOString(),
        };
      },
      logged: (before, after) => ({
        before: { status: before.status },
        after: { status: after.status, number: after.number, total: after.total },
      }),
    }),
  );
}

/**
 * Issues a draft (see issueInvoice) and sends the customer the invoice's e-mail through the
 * outbox (the owner's switch for "invoice-issued" respected; the invoice is issued either way).
 */
export async function issueInvoiceToCustomer(
  db: DB,
  id: number,
  actorId: number | null,
  options: { now?: Date; mail?: SendOptions } = {},
): Promise<Invoice> {
  const invoice = await issueInvoice(db, id, actorId, options.now);
  await tellInvoiceIssued(db, invoice, actorId, options.mail); // never throws
  return invoice;
}

/**
 * Voids an issued invoice nothing has been paid on; it keeps its number. Its payment pages still
 * open online are closed at the provider afterwards (a failure is recorded and retried, never
 * undoing the void).
 */
export async function voidInvoice(
  db: DB,
  id: number,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  const voided = await db.transaction().execute((trx) =>
    changeDocument(trx, "invoice", id, {
      action: "void",
      actorId,
      decide: (before) => {
        if (before.status !== "issued") refuseInState("invoice", before.status, "voided");
        if (compareMoney(before.amountPaid, "0") !== 0) {
          throw new ConflictError(
            "status",
            "Money has been received on this invoice: it cannot be voided.",
          );
        }
        return { status: "void", voided_at: now.toISOString(), updated_at: now.toISOString() };
      },
      logged: (before, after) => ({
        before: { status: before.status },
        after: { status: after.status },
      }),
    }),
  );
  await closeInvoicePaymentPages(db, id); // never throws
  return voided;
}

/** Throws away a draft (it never had a number). */
export async function deleteDraftInvoice(
  db: DB,
  id: number,
  actorId: number | null,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await lockDocument(trx, "invoice", id);
    const before = lockedAt(await findInvoiceById(trx, id), "invoice");
    if (before.status !== "draft") refuseInState("invoice", before.status, "deleted");
    await deleteInvoiceRow(trx, id);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "delete",
      entity: "invoice",
      entityId: id,
      before,
    });
  });
}
