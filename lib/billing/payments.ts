import { createAuditEntry } from "@/db/audit";
import type { PaymentMethod } from "@/db/billing-schema";
import type { DB } from "@/db/client";
import { type Db, lockDocument, updateDocument } from "@/db/document-lines";
import { ConflictError, NotFoundError } from "@/db/errors";
import { findInvoiceById, type Invoice } from "@/db/invoices";
import { insertPayment, markPaymentSessionComplete, type Payment } from "@/db/payments";
import { BillingInputError } from "./errors";
import { formatMoney } from "./format";
import { compareMoney, subtractMoney, sumMoney } from "./money";

/** The invoice with its row locked for the rest of the transaction (see lockRow). */
export async function lockInvoice(trx: Db, id: number): Promise<Invoice | undefined> {
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
    throw new BillingInputError(
      "amount",
      `Only ${formatMoney(owed, invoice.currency)} is still owed on this invoice.`,
    );
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

/**
 * Puts an online payment on an issued invoice and closes its checkout session. The caller owns
 * the transaction and has checked that the payment fits (lib/payments/reconcile.ts
 * `whyNotApplicable`): this still refuses, as addPayment does, anything that does not.
 * `actorId` is null when the provider's notification applies it, the person's id when the
 * counter applies a payment kept to reconcile.
 */
export async function addOnlinePayment(
  trx: Db,
  input: {
    invoiceId: number;
    sessionId: string;
    eventId: string;
    amount: string;
    reference: string | null;
  },
  actorId: number | null,
  now = new Date(),
): Promise<{ payment: Payment; paid: boolean }> {
  const result = await addPayment(
    trx,
    input.invoiceId,
    {
      method: "online",
      amount: input.amount,
      reference: input.reference,
      providerSessionId: input.sessionId,
      providerEventId: input.eventId,
    },
    actorId,
    now,
  );
  await markPaymentSessionComplete(trx, input.sessionId);
  return result;
}
