import type {
  PaymentEventRow,
  PaymentMethod,
  PaymentRow,
  PaymentSessionRow,
} from "./billing-schema";
import type { Db } from "./document-lines";

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

export async function listPaymentsForInvoice(db: Db, invoiceId: number): Promise<Payment[]> {
  const rows = await db
    .selectFrom("payments")
    .selectAll()
    .where("invoice_id", "=", invoiceId)
    .orderBy("id")
    .execute();
  return rows.map(toPayment);
}

/** A payment to store: the amount as the service checked it. */
export interface NewPayment {
  invoiceId: number;
  method: PaymentMethod;
  amount: string;
  reference: string | null;
  providerSessionId: string | null;
  providerEventId: string | null;
  recordedBy: number | null;
  receivedAt: string;
}

export async function insertPayment(db: Db, p: NewPayment): Promise<Payment> {
  const row = await db
    .insertInto("payments")
    .values({
      invoice_id: p.invoiceId,
      method: p.method,
      amount: p.amount,
      reference: p.reference,
      provider_session_id: p.providerSessionId,
      provider_event_id: p.providerEventId,
      recorded_by: p.recordedBy,
      received_at: p.receivedAt,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toPayment(row);
}

/** Whether a payment from this online payment session is stored already. */
export async function paymentSessionApplied(db: Db, sessionId: string): Promise<boolean> {
  const row = await db
    .selectFrom("payments")
    .select("id")
    .where("provider_session_id", "=", sessionId)
    .executeTakeFirst();
  return row !== undefined;
}

export interface PaymentSession {
  id: string;
  invoiceId: number;
  amount: string;
  currency: string;
  status: PaymentSessionRow["status"];
  createdAt: string;
}

export async function insertPaymentSession(
  db: Db,
  input: { id: string; invoiceId: number; amount: string; currency: string },
  actorId: number | null,
): Promise<PaymentSession> {
  const row = await db
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
  return {
    id: row.id,
    invoiceId: row.invoice_id,
    amount: row.amount,
    currency: row.currency,
    status: row.status,
    createdAt: row.created_at,
  };
}

export async function markPaymentSessionComplete(db: Db, id: string): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ status: "complete" })
    .where("id", "=", id)
    .execute();
}

export async function markPaymentSessionExpired(db: Db, id: string): Promise<void> {
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
  db: Db,
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
  db: Db,
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
  db: Db,
  query: { limit?: number } = {},
): Promise<PaymentEventRow[]> {
  return db
    .selectFrom("payment_events")
    .selectAll()
    .orderBy("id", "desc")
    .limit(query.limit ?? 50)
    .execute();
}
