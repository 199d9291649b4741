import type { Kysely } from "kysely";
import { BillingInputError } from "@/lib/billing/errors";
import { compareMoney, subtractMoney, sumMoney } from "@/lib/billing/money";
import { createAuditEntry } from "./audit";
import type {
  PaymentEventRow,
  PaymentMethod,
  PaymentRow,
  PaymentSessionRow,
} from "./billing-schema";
import { lockRow } from "./dialect";
import { ConflictError, NotFoundError } from "./errors";
import type { Database } from "./schema";

export interface Payment {
  id: number;
  invoiceId: number;
  method: PaymentMethod;
  amount: string;
  reference: string | null;
  providerSessionId: string | null;
  recordedBy: number | null;
  receivedAt: string;
}

function toPayment(row: PaymentRow): Payment {
  return {
    id: row.id,
    invoiceId: row.invoice_id,
    method: row.method,
    amount: row.amount,
    reference: row.reference,
    providerSessionId: row.provider_session_id,
    recordedBy: row.recorded_by,
    receivedAt: row.received_at,
  };
}

export async function listPaymentsForInvoice(
  db: Kysely<Database>,
  invoiceId: number,
): Promise<Payment[]> {
  const rows = await db
    .selectFrom("payments")
    .selectAll()
    .where("invoice_id", "=", invoiceId)
    .orderBy("id")
    .execute();
  return rows.map(toPayment);
}

interface NewPayment {
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
  trx: Kysely<Database>,
  invoiceId: number,
  payment: NewPayment,
  actorId: number | null,
  now: Date,
): Promise<{ payment: Payment; paid: boolean }> {
  await lockRow(trx, "invoices", invoiceId);
  const invoice = await trx
    .selectFrom("invoices")
    .select(["id", "status", "total", "amount_paid", "version"])
    .where("id", "=", invoiceId)
    .executeTakeFirst();
  if (!invoice) throw new NotFoundError("invoice");
  if (invoice.status !== "issued") {
    throw new ConflictError("status", `An invoice that is ${invoice.status} takes no payment.`);
  }
  const owed = subtractMoney(invoice.total, invoice.amount_paid);
  const amount = sumMoney([payment.amount]);
  if (compareMoney(amount, "0") <= 0) {
    throw new BillingInputError("amount", "Enter the amount received.");
  }
  if (compareMoney(amount, owed) > 0) {
    throw new BillingInputError("amount", `Only ${owed} is still owed on this invoice.`);
  }
  const receivedAt = payment.receivedAt ?? now.toISOString();
  const row = await trx
    .insertInto("payments")
    .values({
      invoice_id: invoiceId,
      method: payment.method,
      amount,
      reference: payment.reference ?? null,
      provider_session_id: payment.providerSessionId ?? null,
      provider_event_id: payment.providerEventId ?? null,
      recorded_by: actorId,
      received_at: receivedAt,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  const amountPaid = sumMoney([invoice.amount_paid, amount]);
  const paid = compareMoney(amountPaid, invoice.total) >= 0;
  await trx
    .updateTable("invoices")
    .set({
      amount_paid: amountPaid,
      status: paid ? "paid" : "issued",
      paid_at: paid ? receivedAt : null,
      version: invoice.version + 1,
      updated_at: now.toISOString(),
    })
    .where("id", "=", invoiceId)
    .execute();
  const recorded = toPayment(row);
  await createAuditEntry(trx, {
    userId: actorId,
    action: paid ? "payment-paid-in-full" : "payment",
    entity: "invoice",
    entityId: invoiceId,
    before: { status: invoice.status, amountPaid: invoice.amount_paid },
    after: { status: paid ? "paid" : "issued", amountPaid, payment: recorded },
  });
  return { payment: recorded, paid };
}

/** Money the counter took in the shop (cash, bank transfer, card on the shop's terminal). */
export async function recordManualPayment(
  db: Kysely<Database>,
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
  trx: Kysely<Database>,
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
  await lockRow(trx, "invoices", input.invoiceId);
  const invoice = await trx
    .selectFrom("invoices")
    .select(["id", "status", "currency", "total", "amount_paid"])
    .where("id", "=", input.invoiceId)
    .executeTakeFirst();
  if (!invoice) return "unknown-invoice";
  const applied = await trx
    .selectFrom("payments")
    .select("id")
    .where("provider_session_id", "=", input.sessionId)
    .executeTakeFirst();
  if (applied) return "session-already-applied";
  if (invoice.status !== "issued") return "already-settled";
  if (invoice.currency.toLowerCase() !== input.currency.toLowerCase()) return "currency-mismatch";
  if (compareMoney(input.amount, subtractMoney(invoice.total, invoice.amount_paid)) > 0) {
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
  await trx
    .updateTable("payment_sessions")
    .set({ status: "complete" })
    .where("id", "=", input.sessionId)
    .execute();
  return paid ? "paid" : "part-paid";
}

export interface PaymentSession {
  id: string;
  invoiceId: number;
  amount: string;
  currency: string;
  status: PaymentSessionRow["status"];
  createdAt: string;
}

export async function createPaymentSession(
  db: Kysely<Database>,
  input: { id: string; invoiceId: number; amount: string; currency: string },
  actorId: number | null,
): Promise<PaymentSession> {
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto("payment_sessions")
      .values({
        id: input.id,
        invoice_id: input.invoiceId,
        amount: input.amount,
        currency: input.currency,
        created_by: actorId,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    await createAuditEntry(trx, {
      userId: actorId,
      action: "checkout-started",
      entity: "invoice",
      entityId: input.invoiceId,
      after: { sessionId: input.id, amount: input.amount, currency: input.currency },
    });
    return {
      id: row.id,
      invoiceId: row.invoice_id,
      amount: row.amount,
      currency: row.currency,
      status: row.status,
      createdAt: row.created_at,
    };
  });
}

export async function markPaymentSessionExpired(db: Kysely<Database>, id: string): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ status: "expired" })
    .where("id", "=", id)
    .where("status", "=", "open")
    .execute();
}

/**
 * Stores a notification's id before it is acted on. Returns the row id, or undefined when the
 * same event id was stored before (a repeat delivery). Events without an id (rejected ones) are
 * always stored.
 */
export async function createPaymentEvent(
  db: Kysely<Database>,
  input: {
    eventId: string | null;
    type: string | null;
    outcome: string;
    invoiceId?: number | null;
    detail?: string | null;
  },
): Promise<number | undefined> {
  const row = await db
    .insertInto("payment_events")
    .values({
      event_id: input.eventId,
      type: input.type,
      outcome: input.outcome,
      invoice_id: input.invoiceId ?? null,
      detail: input.detail?.slice(0, 500) ?? null,
    })
    .onConflict((oc) => oc.column("event_id").doNothing())
    .returning("id")
    .executeTakeFirst();
  return row?.id;
}

export async function updatePaymentEventOutcome(
  db: Kysely<Database>,
  id: number,
  outcome: string,
  invoiceId: number | null,
): Promise<void> {
  await db
    .updateTable("payment_events")
    .set({ outcome, invoice_id: invoiceId })
    .where("id", "=", id)
    .execute();
}

export async function listPaymentEvents(
  db: Kysely<Database>,
  query: { limit?: number } = {},
): Promise<PaymentEventRow[]> {
  return db
    .selectFrom("payment_events")
    .selectAll()
    .orderBy("id", "desc")
    .limit(query.limit ?? 50)
    .execute();
}
