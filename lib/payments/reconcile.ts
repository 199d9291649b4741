import type { UnappliedPaymentStatus } from "@/db/billing-schema";
import type { DB } from "@/db/client";
import { createAuditEntry } from "@/db/audit";
import { ConflictError, NotFoundError, StaleWriteError } from "@/db/errors";
import type { Invoice } from "@/db/invoices";
import {
  countOpenUnappliedPayments,
  findPaymentSession,
  listUnappliedPayments,
  lockUnappliedPayment,
  resolveUnappliedPayment,
  type UnappliedPayment,
  type UnappliedPaymentListed,
  unappliedPaymentForSession,
} from "@/db/payments";
import { formatMoney } from "@/lib/billing/format";
import { compareMoney, subtractMoney } from "@/lib/billing/money";
import { addOnlinePayment, lockInvoice } from "@/lib/billing/payments";
import { HttpError } from "@/lib/http/errors";
import type { UnappliedReason } from "./reasons";

/** Why a payment cannot go on the invoice as it stands now: the reason kept and the words shown. */
export interface NotApplicable {
  reason: UnappliedReason;
  message: string;
}

/**
 * Whether an online payment of `amount` in `currency` fits what is owed on `invoice` now: null
 * when it does, else why not (the invoice is unknown, paid, void or a draft, another currency,
 * or more than is still owed). Used by the webhook before applying a payment and by "apply as
 * payment" on one kept to reconcile, so both refuse the same things with the same words.
 *
 * @example whyNotApplicable(invoiceOwing168_61, "178.61", "usd")
 *   // { reason: "over-owed", message: "$178.61 is more than the $168.61 still owed on INV-2026-0004: refund it." }
 */
export function whyNotApplicable(
  invoice: Invoice | undefined,
  amount: string,
  currency: string,
): NotApplicable | null {
  if (!invoice) {
    return {
      reason: "unknown-session",
      message: "This payment belongs to no invoice of ours: refund it.",
    };
  }
  const name = invoice.number ?? `draft invoice ${invoice.id}`;
  if (invoice.status === "void") {
    return { reason: "invoice-void", message: `${name} is void: refund this payment.` };
  }
  if (invoice.status !== "issued") {
    return {
      reason: "invoice-settled",
      message: `Nothing is owed on ${name}: it is ${invoice.status}. Refund this payment.`,
    };
  }
  if (invoice.currency.toLowerCase() !== currency.toLowerCase()) {
    return {
      reason: "currency-mismatch",
      message: `This payment is in ${currency.toUpperCase()} and ${name} is in ${invoice.currency}: refund it.`,
    };
  }
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  if (compareMoney(amount, owed) > 0) {
    return {
      reason: "over-owed",
      message: `${formatMoney(amount, invoice.currency)} is more than the ${formatMoney(owed, invoice.currency)} still owed on ${name}: refund it.`,
    };
  }
  return null;
}

function stillOpen(item: UnappliedPayment | undefined): UnappliedPayment {
  if (!item) throw new NotFoundError("payment to reconcile");
  if (item.status !== "open") {
    throw new ConflictError(
      "status",
      item.status === "applied"
        ? "This payment was already applied to its invoice."
        : "This payment was already marked refunded.",
    );
  }
  return item;
}

/**
 * "Apply as payment": puts a payment kept to reconcile on its invoice, where it fits what is owed
 * now. Refuses with 409 `does_not_fit` and the reason in words otherwise (no invoice, paid, void,
 * another currency, more than is owed), 409 `stale_write` when `version` is not the stored one.
 * Audited on the payment and (by the payment itself) on the invoice.
 */
export async function applyUnappliedPayment(
  db: DB,
  id: number,
  version: number,
  actorId: number,
  now = new Date(),
): Promise<{ item: UnappliedPayment; paid: boolean }> {
  return db.transaction().execute(async (trx) => {
    const item = stillOpen(await lockUnappliedPayment(trx, id));
    const invoice = item.invoiceId === null ? undefined : await lockInvoice(trx, item.invoiceId);
    if (item.version !== version) throw new StaleWriteError("payment to reconcile", item.version);
    const refusal = whyNotApplicable(invoice, item.amount, item.currency);
    if (refusal) throw new HttpError(409, "does_not_fit", refusal.message);
    const { payment, paid } = await addOnlinePayment(
      trx,
      {
        invoiceId: invoice!.id,
        sessionId: item.sessionId,
        eventId: item.eventId,
        amount: item.amount,
        reference: item.reference,
      },
      actorId,
      now,
    );
    const resolved = await resolveUnappliedPayment(trx, id, version, {
      status: "applied",
      note: null,
      paymentId: payment.id,
      resolvedBy: actorId,
      resolvedAt: now.toISOString(),
    });
    await createAuditEntry(trx, {
      userId: actorId,
      action: "online-payment-applied",
      entity: "unapplied_payment",
      entityId: id,
      before: { status: item.status, version: item.version },
      after: { status: resolved.status, version: resolved.version, paymentId: payment.id },
    });
    return { item: resolved, paid };
  });
}

/**
 * "Mark refunded": records that the money went back to the payer at the payment service, with the
 * counter's note (what was done, a refund reference). 409 when stale or no longer open. Audited.
 */
export async function markUnappliedPaymentRefunded(
  db: DB,
  id: number,
  input: { version: number; note: string },
  actorId: number,
  now = new Date(),
): Promise<UnappliedPayment> {
  return db.transaction().execute(async (trx) => {
    const item = stillOpen(await lockUnappliedPayment(trx, id));
    const resolved = await resolveUnappliedPayment(trx, id, input.version, {
      status: "refunded",
      note: input.note,
      paymentId: null,
      resolvedBy: actorId,
      resolvedAt: now.toISOString(),
    });
    await createAuditEntry(trx, {
      userId: actorId,
      action: "online-payment-refunded",
      entity: "unapplied_payment",
      entityId: id,
      before: { status: item.status, version: item.version },
      after: { status: resolved.status, version: resolved.version, note: input.note },
    });
    return resolved;
  });
}

/** How many online payments are still to reconcile: the count beside the invoices list's link. */
export function countPaymentsToReconcile(db: DB): Promise<number> {
  return countOpenUnappliedPayments(db);
}

/** The list for the counter and the owner: open ones by default, newest first. */
export async function listPaymentsToReconcile(
  db: DB,
  query: { status?: UnappliedPaymentStatus | "all"; invoiceId?: number } = {},
): Promise<UnappliedPaymentListed[]> {
  const status = query.status ?? "open";
  return listUnappliedPayments(db, {
    status: status === "all" ? undefined : status,
    invoiceId: query.invoiceId,
  });
}

/**
 * The payment the customer just made on `sessionId` when it was kept to reconcile instead of
 * going on the invoice, for the page they return to; undefined when there is none or the session
 * is not this invoice's (the caller has checked the person may see the invoice).
 */
export async function heldPaymentForReturn(
  db: DB,
  invoiceId: number,
  sessionId: string,
): Promise<UnappliedPayment | undefined> {
  const held = await unappliedPaymentForSession(db, sessionId);
  if (!held) return undefined;
  if (held.invoiceId === invoiceId) return held;
  const session = await findPaymentSession(db, sessionId);
  return session?.invoiceId === invoiceId ? held : undefined;
}
