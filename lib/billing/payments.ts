import { createAuditEntry } from "@/db/audit";
import type { PaymentMethod } from "@/db/billing-schema";
import type { DB } from "@/db/client";
import { type Db, lockDocument, updateDocument } from "@/db/document-lines";
import { ConflictError, NotFoundError } from "@/db/errors";
import { findInvoiceById, type Invoice } from "@/db/invoices";
import {
  insertPayment,
  insertPaymentSession,
  markPaymentSessionComplete,
  type Payment,
  type PaymentSession,
  paymentSessionApplied,
} from "@/db/payments";
import { BillingInputError } from "./errors";
import { compareMoney, subtractMoney, sumMoney } from "./money";

/** The invoice with its row locked for the rest of the transaction (see lockRow). */
async function lockInvoice(trx: Db, id: number): Promise<Invoice | undefined> {
  await lockDocument(trx, "invoice", id);
  return findInvoiceById(trx, id);
}

interface MoneyReceived {
  method: PaymentMethod;
  amount: string;
  reference?: string | null;
  providerSessionId?: string | null;
  providerEventId?: string | null;
  receivedAt?: string;
}

/**
 * Adds money received to an issued invoice and marks it paid once the total is covered. The
 * caller owns the transaction. Throws ConflictError unless the invoice is issued, and
 * BillingInputError when the amount is more than is still owed.
 */
async function addPayment(
  trx: Db,
  invoiceId: number,
  received: MoneyReceived,
  actorId: number | null,
  now: Date,
): Promise<{ payment: Payment; paid: boolean }> {
  const invoice = await lockInvoice(trx, invoiceId);
  if (!invoice) throw new NotFoundError("invoice");
  if (invoice.status !== "issued") {
    throw new ConflictError("status", `An invoice that is ${invoice.status} takes no payment.`);
  }
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  const amount = sumMoney([received.amount]);
  if (compareMoney(amount, "0") <= 0) {
    throw new BillingInputError("amount", "Enter the amount received.");
  }
  if (compareMoney(amount, owed) > 0) {
    throw new BillingInputError("amount", `Only ${owed} is still owed on this invoice.`);
  }
  const receivedAt = received.receivedAt ?? now.toISOString();
  const payment = await insertPayment(trx, {
    invoiceId,
    method: received.method,
    amount,
    reference: received.reference ?? null,
    providerSessionId: received.providerSessionId ?? null,
    providerEventId: received.providerEventId ?? null,
    recordedBy: actorId,
    receivedAt,
  });
  const amountPaid = sumMoney([invoice.amountPaid, amount]);
  const paid = compareMoney(amountPaid, invoice.total) >= 0;
  await updateDocument(trx, "invoice", invoiceId, invoice.version, {
    amount_paid: amountPaid,
    status: paid ? "paid" : "issued",
    paid_at: paid ? receivedAt : null,
    updated_at: now.toISOString(),
  });
  await createAuditEntry(trx, {
    userId: actorId,
    action: paid ? "payment-paid-in-full" : "payment",
    entity: "invoice",
    entityId: invoiceId,
    before: { status: invoice.status, amountPaid: invoice.amountPaid },
    after: { status: paid ? "paid" : "issued", amountPaid, payment },
  });
  return { payment, paid };
}

/** Money the counter took in the shop (cash, bank transfer, card on the shop's terminal). */
export async function recordManualPayment(
  db: DB,
  invoiceId: number,
  input: {
    method: Exclude<PaymentMethod, "online">;
    amount: string;
    reference?: string | null;
    receivedAt?: string;
  },
  actorId: number | null,
  now = new Date(),
): Promise<{ payment: Payment; paid: boolean }> {
  return db.transaction().execute((trx) => addPayment(trx, invoiceId, { ...input }, actorId, now));
}

export type OnlinePaymentOutcome =
  | "paid"
  | "part-paid"
  | "already-settled"
  | "session-already-applied"
  | "unknown-invoice"
  | "currency-mismatch"
  | "amount-mismatch";

/**
 * Applies a completed online payment exactly once. Nothing changes when the invoice is no longer
 * open (already paid, void), when this session was applied before, or when the currency or
 * amount does not fit what is owed; the outcome says which. The caller owns the transaction.
 */
export async function applyOnlinePayment(
  trx: Db,
  input: {
    invoiceId: number;
    sessionId: string;
    eventId: string;
    amount: string;
    currency: string;
    reference: string | null;
  },
  now = new Date(),
): Promise<OnlinePaymentOutcome> {
  const invoice = await lockInvoice(trx, input.invoiceId);
  if (!invoice) return "unknown-invoice";
  if (await paymentSessionApplied(trx, input.sessionId)) return "session-already-applied";
  if (invoice.status !== "issued") return "already-settled";
  if (invoice.currency.toLowerCase() !== input.currency.toLowerCase()) return "currency-mismatch";
  if (compareMoney(input.amount, subtractMoney(invoice.total, invoice.amountPaid)) > 0) {
    return "amount-mismatch";
  }
  const { paid } = await addPayment(
    trx,
    input.invoiceId,
    {
      method: "online",
      amount: input.amount,
      reference: input.reference,
      providerSessionId: input.sessionId,
      providerEventId: input.eventId,
    },
    null,
    now,
  );
  await markPaymentSessionComplete(trx, input.sessionId);
  return paid ? "paid" : "part-paid";
}

/** Records that a hosted payment page was opened for an invoice, with who opened it. */
export async function createPaymentSession(
  db: DB,
  input: { id: string; invoiceId: number; amount: string; currency: string },
  actorId: number | null,
): Promise<PaymentSession> {
  return db.transaction().execute(async (trx) => {
    const session = await insertPaymentSession(trx, input, actorId);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "checkout-started",
      entity: "invoice",
      entityId: input.invoiceId,
      after: { sessionId: input.id, amount: input.amount, currency: input.currency },
    });
    return session;
  });
}
