import { findCardPdf, findCard } from "@/db/cards";
import type { DB } from "@/db/client";
import { findInvoiceById, type Invoice } from "@/db/invoices";
import { listMailLog } from "@/db/mail";
import type { Quote } from "@/db/quotes";
import { formatMoney } from "@/lib/billing/format";
import { compareMoney, subtractMoney } from "@/lib/billing/money";
import { cardFileName, cardVerifyUrl } from "@/lib/cards/urls";
import { type NotifyOutcome, notifyCustomer } from "./notify";
import type { SendOptions } from "./send";

// Where the shop's services tell the customer: each is called once the event has been saved.

/** A quote was offered to the customer. */
export function tellQuoteOffered(
  db: DB,
  quote: Quote,
  actorId: number | null,
  options?: SendOptions,
): Promise<NotifyOutcome> {
  return notifyCustomer(
    db,
    {
      kind: "quote-offered",
      jobId: quote.jobId,
      quoteNumber: quote.number,
      total: formatMoney(quote.total, quote.currency),
    },
    actorId,
    options,
  );
}

/** An invoice was issued (it has its number now). */
export function tellInvoiceIssued(
  db: DB,
  invoice: Invoice,
  actorId: number | null,
  options?: SendOptions,
): Promise<NotifyOutcome> {
  return notifyCustomer(
    db,
    {
      kind: "invoice-issued",
      jobId: invoice.jobId,
      invoiceNumber: invoice.number ?? "",
      total: formatMoney(invoice.total, invoice.currency),
    },
    actorId,
    options,
  );
}

/** Money was received against an invoice: `amount` is what came in this time. */
export async function tellPaymentReceived(
  db: DB,
  invoiceId: number,
  amount: string,
  actorId: number | null,
  options?: SendOptions,
): Promise<NotifyOutcome> {
  const invoice = await findInvoiceById(db, invoiceId);
  if (!invoice) return { sent: false, skipped: "no-job" };
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  return notifyCustomer(
    db,
    {
      kind: "payment-received",
      jobId: invoice.jobId,
      invoiceNumber: invoice.number ?? "",
      amount: formatMoney(amount, invoice.currency),
      owed: compareMoney(owed, "0") > 0 ? formatMoney(owed, invoice.currency) : null,
    },
    actorId,
    options,
  );
}

/** The job was moved to ready to collect. */
export function tellReadyToCollect(
  db: DB,
  jobId: number,
  actorId: number | null,
  options?: SendOptions,
): Promise<NotifyOutcome> {
  return notifyCustomer(db, { kind: "ready-to-collect", jobId }, actorId, options);
}

/**
 * A card was issued again (revision 2 or later). When an earlier revision had been e-mailed to
 * the customer, the new one goes to them too, attached, so they do not keep a replaced card.
 * Null when no earlier card was sent.
 */
export async function tellCardReissued(
  db: DB,
  jobId: number,
  jobNumber: string,
  revision: number,
  actorId: number | null,
  options?: SendOptions,
): Promise<NotifyOutcome | null> {
  if (revision < 2) return null;
  const sent = await listMailLog(db, { jobId, status: "sent", limit: 200 });
  if (!sent.some((m) => m.kind === "balance-card" || m.kind === "card-reissued")) return null;
  const [card, pdf] = await Promise.all([
    findCard(db, jobId, revision),
    findCardPdf(db, jobId, revision),
  ]);
  if (!card || !pdf) return null;
  return notifyCustomer(
    db,
    {
      kind: "card-reissued",
      jobId,
      revision,
      verifyUrl: cardVerifyUrl(card.verificationCode),
      attachment: {
        filename: cardFileName(jobNumber, revision),
        content: pdf,
        contentType: "application/pdf",
      },
    },
    actorId,
    options,
  );
}
