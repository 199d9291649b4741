import type {
  PaymentEventRow,
  PaymentMethod,
  PaymentRow,
  PaymentSessionRow,
  UnappliedPaymentRow,
  UnappliedPaymentStatus,
} from "./billing-schema";
import { forUpdate } from "./dialect";
import type { Db } from "./document-lines";
import { NotFoundError, StaleWriteError } from "./errors";

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
  /** The provider's payment page; null once closed (or for sessions stored before it was kept). */
  url: string | null;
  expiresAt: string | null;
  createdAt: string;
  /** When closing it at the provider last failed; null when nothing is pending. */
  closeFailedAt: string | null;
}

function toPaymentSession(row: PaymentSessionRow): PaymentSession {
  return {
    id: row.id,
    invoiceId: row.invoice_id,
    amount: row.amount,
    currency: row.currency,
    status: row.status,
    url: row.url,
    expiresAt: row.expires_at,
    createdAt: row.created_at,
    closeFailedAt: row.close_failed_at,
  };
}

export async function insertPaymentSession(
  db: Db,
  input: {
    id: string;
    invoiceId: number;
    amount: string;
    currency: string;
    url: string | null;
    expiresAt: string | null;
  },
  actorId: number | null,
): Promise<PaymentSession> {
  const row = await db
    .insertInto("payment_sessions")
    .values({
      id: input.id,
      invoice_id: input.invoiceId,
      amount: input.amount,
      currency: input.currency,
      url: input.url,
      expires_at: input.expiresAt,
      created_by: actorId,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toPaymentSession(row);
}

export async function findPaymentSession(db: Db, id: string): Promise<PaymentSession | undefined> {
  const row = await db
    .selectFrom("payment_sessions")
    .selectAll()
    .where("id", "=", id)
    .executeTakeFirst();
  return row && toPaymentSession(row);
}

/** The invoice's sessions still open on our side, newest first. */
export async function listOpenPaymentSessions(
  db: Db,
  invoiceId: number,
): Promise<PaymentSession[]> {
  const rows = await db
    .selectFrom("payment_sessions")
    .selectAll()
    .where("invoice_id", "=", invoiceId)
    .where("status", "=", "open")
    .orderBy("created_at", "desc")
    .orderBy("id", "desc")
    .execute();
  return rows.map(toPaymentSession);
}

export async function markPaymentSessionComplete(db: Db, id: string): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ status: "complete", url: null })
    .where("id", "=", id)
    .execute();
}

export async function markPaymentSessionExpired(db: Db, id: string): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ status: "expired", url: null, close_failed_at: null, close_error: null })
    .where("id", "=", id)
    .where("status", "=", "open")
    .execute();
}

/** Records that closing this page at the provider failed, so a later checkout tries again. */
export async function markPaymentSessionCloseFailed(
  db: Db,
  id: string,
  at: string,
  error: string,
): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ close_failed_at: at, close_error: error.slice(0, 500) })
    .where("id", "=", id)
    .where("status", "=", "open")
    .execute();
}

/** Nothing is left to close for this page (the provider has it paid or closed). */
export async function clearPaymentSessionCloseFailure(db: Db, id: string): Promise<void> {
  await db
    .updateTable("payment_sessions")
    .set({ close_failed_at: null, close_error: null })
    .where("id", "=", id)
    .execute();
}

/** Open pages whose closing at the provider failed, oldest failure first. */
export async function listPaymentSessionsToClose(db: Db, limit = 20): Promise<PaymentSession[]> {
  const rows = await db
    .selectFrom("payment_sessions")
    .selectAll()
    .where("status", "=", "open")
    .where("close_failed_at", "is not", null)
    .orderBy("close_failed_at")
    .orderBy("id")
    .limit(limit)
    .execute();
  return rows.map(toPaymentSession);
}

/**
 * Stores a signed notification's id before it is acted on. Returns the row id, or undefined when
 * the same event id was stored before (a repeat delivery). Unsigned or wrongly signed requests are
 * never stored (anyone can send them).
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

/** An online payment received and not put on an invoice (see lib/payments/reconcile.ts). */
export interface UnappliedPayment {
  id: number;
  eventId: string;
  sessionId: string;
  invoiceId: number | null;
  amount: string;
  currency: string;
  reason: string;
  reference: string | null;
  status: UnappliedPaymentStatus;
  note: string | null;
  paymentId: number | null;
  resolvedBy: number | null;
  resolvedAt: string | null;
  receivedAt: string;
  version: number;
}

/** With the invoice it came for, when we know it, for the lists. */
export interface UnappliedPaymentListed extends UnappliedPayment {
  invoiceNumber: string | null;
  jobId: number | null;
  resolvedByName: string | null;
}

function toUnapplied(row: UnappliedPaymentRow): UnappliedPayment {
  return {
    id: row.id,
    eventId: row.event_id,
    sessionId: row.session_id,
    invoiceId: row.invoice_id,
    amount: row.amount,
    currency: row.currency,
    reason: row.reason,
    reference: row.reference,
    status: row.status,
    note: row.note,
    paymentId: row.payment_id,
    resolvedBy: row.resolved_by,
    resolvedAt: row.resolved_at,
    receivedAt: row.received_at,
    version: row.version,
  };
}

export async function insertUnappliedPayment(
  db: Db,
  input: {
    eventId: string;
    sessionId: string;
    invoiceId: number | null;
    amount: string;
    currency: string;
    reason: string;
    reference: string | null;
    receivedAt: string;
  },
): Promise<UnappliedPayment> {
  const row = await db
    .insertInto("unapplied_payments")
    .values({
      event_id: input.eventId,
      session_id: input.sessionId,
      invoice_id: input.invoiceId,
      amount: input.amount,
      currency: input.currency,
      reason: input.reason,
      reference: input.reference,
      received_at: input.receivedAt,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  return toUnapplied(row);
}

/** Whether a payment from this session is already kept to reconcile. */
export async function unappliedPaymentForSession(
  db: Db,
  sessionId: string,
): Promise<UnappliedPayment | undefined> {
  const row = await db
    .selectFrom("unapplied_payments")
    .selectAll()
    .where("session_id", "=", sessionId)
    .executeTakeFirst();
  return row && toUnapplied(row);
}

/** One, with its row locked for the rest of the transaction on PostgreSQL. */
export async function lockUnappliedPayment(
  db: Db,
  id: number,
): Promise<UnappliedPayment | undefined> {
  const row = await db
    .selectFrom("unapplied_payments")
    .selectAll()
    .where("id", "=", id)
    .$call(forUpdate(db))
    .executeTakeFirst();
  return row && toUnapplied(row);
}

export async function listUnappliedPayments(
  db: Db,
  query: { status?: UnappliedPaymentStatus; invoiceId?: number; limit?: number } = {},
): Promise<UnappliedPaymentListed[]> {
  let q = db
    .selectFrom("unapplied_payments as u")
    .leftJoin("invoices as i", "i.id", "u.invoice_id")
    .leftJoin("users as r", "r.id", "u.resolved_by")
    .selectAll("u")
    .select(["i.number as invoice_number", "i.job_id as job_id", "r.name as resolved_by_name"]);
  if (query.status) q = q.where("u.status", "=", query.status);
  if (query.invoiceId !== undefined) q = q.where("u.invoice_id", "=", query.invoiceId);
  const rows = await q
    .orderBy("u.id", "desc")
    .limit(query.limit ?? 200)
    .execute();
  return rows.map((row) => ({
    ...toUnapplied(row),
    invoiceNumber: row.invoice_number ?? null,
    jobId: row.job_id ?? null,
    resolvedByName: row.resolved_by_name ?? null,
  }));
}

/** How many are still open: the count beside the invoices list. */
export async function countOpenUnappliedPayments(db: Db): Promise<number> {
  const row = await db
    .selectFrom("unapplied_payments")
    .select((eb) => eb.fn.countAll<number | string>().as("n"))
    .where("status", "=", "open")
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

/**
 * Closes one as applied or refunded, if it is still at `version` (StaleWriteError otherwise).
 */
export async function resolveUnappliedPayment(
  db: Db,
  id: number,
  version: number,
  changes: {
    status: Exclude<UnappliedPaymentStatus, "open">;
    note: string | null;
    paymentId: number | null;
    resolvedBy: number | null;
    resolvedAt: string;
  },
): Promise<UnappliedPayment> {
  const row = await db
    .updateTable("unapplied_payments")
    .set({
      status: changes.status,
      note: changes.note,
      payment_id: changes.paymentId,
      resolved_by: changes.resolvedBy,
      resolved_at: changes.resolvedAt,
      version: version + 1,
    })
    .where("id", "=", id)
    .where("version", "=", version)
    .returningAll()
    .executeTakeFirst();
  if (row) return toUnapplied(row);
  const now = await db
    .selectFrom("unapplied_payments")
    .select("version")
    .where("id", "=", id)
    .executeTakeFirst();
  if (!now) throw new NotFoundError("payment to reconcile");
  throw new StaleWriteError("payment to reconcile", now.version);
}
