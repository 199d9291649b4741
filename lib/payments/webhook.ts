import Stripe from "stripe";
import type { Db } from "@/db/document-lines";
import type { DB } from "@/db/client";
import {
  createPaymentEvent,
  findPaymentSession,
  insertUnappliedPayment,
  markPaymentSessionComplete,
  markPaymentSessionExpired,
  paymentSessionApplied,
  unappliedPaymentForSession,
  updatePaymentEventOutcome,
} from "@/db/payments";
import { createAuditEntry } from "@/db/audit";
import { compareMoney, fromMinorUnits } from "@/lib/billing/money";
import { addOnlinePayment, lockInvoice } from "@/lib/billing/payments";
import { tellPaymentReceived } from "@/lib/mail/events";
import type { UnappliedReason } from "./reasons";
import { whyNotApplicable } from "./reconcile";

export type WebhookOutcome =
  | "paid"
  | "part-paid"
  | "to-reconcile"
  | "duplicate"
  | "session-already-applied"
  | "already-kept"
  | "not-paid-yet"
  | "session-expired"
  | "ignored";

export interface WebhookResult {
  status: 200 | 400;
  body:
    | { received: true; outcome: WebhookOutcome; reason?: UnappliedReason }
    | { error: { code: string; message: string } };
}

let rejected = 0;

/**
 * How many notifications this server refused for their signature since it started. They are
 * counted and logged, never stored: anyone can send one, and a refusal must cost us no write.
 */
export function rejectedNotificationCount(): number {
  return rejected;
}

function invoiceIdOf(session: Stripe.Checkout.Session): number | null {
  const raw = session.metadata?.invoiceId ?? session.client_reference_id;
  const id = Number(raw);
  return raw && Number.isSafeInteger(id) && id > 0 ? id : null;
}

interface Settled {
  outcome: WebhookOutcome;
  reason?: UnappliedReason;
  invoiceId: number | null;
  applied?: { invoiceId: number; amount: string };
}

/**
 * A paid checkout session, checked against the session we stored when the payment page was
 * opened: the invoice, the amount and the currency are ours, never the event's. A payment that
 * matches an open session and fits what is owed goes on the invoice; anything else (no such
 * session, another invoice named, another amount or currency, a session closed, an invoice paid
 * or void, more than is owed) is kept to reconcile, once per session.
 */
async function settlePaidSession(
  trx: Db,
  event: Stripe.Event,
  session: Stripe.Checkout.Session,
  now: Date,
): Promise<Settled> {
  const amount = fromMinorUnits(session.amount_total ?? 0);
  const currency = (session.currency ?? "").toUpperCase();
  const stored = await findPaymentSession(trx, session.id);
  const invoice = stored ? await lockInvoice(trx, stored.invoiceId) : undefined;
  const invoiceId = invoice?.id ?? null;
  if (await paymentSessionApplied(trx, session.id)) {
    return { outcome: "session-already-applied", invoiceId };
  }
  if (await unappliedPaymentForSession(trx, session.id)) {
    return { outcome: "already-kept", invoiceId };
  }

  let reason: UnappliedReason | null = null;
  const claimed = invoiceIdOf(session);
  if (!stored) reason = "unknown-session";
  else if (claimed !== null && claimed !== stored.invoiceId) reason = "invoice-mismatch";
  else if (stored.currency.toUpperCase() !== currency) reason = "currency-mismatch";
  else if (compareMoney(stored.amount, amount) !== 0) reason = "amount-differs";
  else if (stored.status !== "open") reason = "session-closed";
  else reason = whyNotApplicable(invoice, amount, currency)?.reason ?? null;

  // The provider's page is finished either way: never offer it again.
  if (stored) await markPaymentSessionComplete(trx, session.id);
  const reference = typeof session.payment_intent === "string" ? session.payment_intent : null;

  if (reason === null) {
    const { paid } = await addOnlinePayment(
      trx,
      { invoiceId: invoice!.id, sessionId: session.id, eventId: event.id, amount, reference },
      null,
      now,
    );
    return {
      outcome: paid ? "paid" : "part-paid",
      invoiceId,
      applied: { invoiceId: invoice!.id, amount },
    };
  }
  const kept = await insertUnappliedPayment(trx, {
    eventId: event.id,
    sessionId: session.id,
    invoiceId,
    amount,
    currency,
    reason,
    reference,
    receivedAt: now.toISOString(),
  });
  await createAuditEntry(trx, {
    userId: null,
    action: "online-payment-kept-to-reconcile",
    entity: "unapplied_payment",
    entityId: kept.id,
    after: { invoiceId, amount, currency, reason, sessionId: session.id, claimedInvoice: claimed },
  });
  return { outcome: "to-reconcile", reason, invoiceId };
}

/**
 * Handles one notification from the payment provider. The raw body is checked against its
 * signature before anything in it is believed: an unsigned or wrongly signed request is counted,
 * logged and answered 400, and nothing is written. Each event id is acted on once (a repeat
 * delivery changes nothing); a paid session is checked against the one we stored (see
 * settlePaidSession), so money is either on an invoice or kept to reconcile, never lost.
 */
export async function handlePaymentWebhook(
  db: DB,
  payload: string,
  signature: string | null,
  secret: string,
  now = new Date(),
): Promise<WebhookResult> {
  let event: Stripe.Event;
  try {
    if (!signature) throw new Error("no Stripe-Signature header");
    event = Stripe.webhooks.constructEvent(payload, signature, secret);
  } catch (error) {
    rejected += 1;
    const reason = (error instanceof Error ? error.message : String(error)).replace(/\s+/g, " ");
    console.warn(
      `payment notification rejected (${rejected} since start), ${signature ? "bad signature" : "unsigned"}: ${reason.slice(0, 200)}`,
    );
    return {
      status: 400,
      body: {
        error: {
          code: "bad_signature",
          message: "The notification's signature does not check out.",
        },
      },
    };
  }

  const settled = await db.transaction().execute(async (trx): Promise<Settled> => {
    const rowId = await createPaymentEvent(trx, {
      eventId: event.id,
      type: event.type,
      outcome: "received",
    });
    if (rowId === undefined) return { outcome: "duplicate", invoiceId: null };
    let result: Settled = { outcome: "ignored", invoiceId: null };
    if (
      event.type === "checkout.session.completed" ||
      event.type === "checkout.session.async_payment_succeeded"
    ) {
      const session = event.data.object;
      if (session.payment_status !== "paid") {
        const stored = await findPaymentSession(trx, session.id);
        result = { outcome: "not-paid-yet", invoiceId: stored?.invoiceId ?? null };
      } else {
        result = await settlePaidSession(trx, event, session, now);
      }
    } else if (event.type === "checkout.session.expired") {
      const stored = await findPaymentSession(trx, event.data.object.id);
      await markPaymentSessionExpired(trx, event.data.object.id);
      result = { outcome: "session-expired", invoiceId: stored?.invoiceId ?? null };
    }
    await updatePaymentEventOutcome(
      trx,
      rowId,
      result.reason ? `${result.outcome}: ${result.reason}` : result.outcome,
      result.invoiceId,
    );
    return result;
  });
  // The customer's receipt goes out once the payment is on the books (through the outbox; a mail
  // failure is logged there and never undoes the payment).
  if (settled.applied) {
    await tellPaymentReceived(db, settled.applied.invoiceId, settled.applied.amount, null);
  }
  if (settled.outcome === "to-reconcile") {
    console.warn(
      `payment notification ${event.id}: kept to reconcile (${settled.reason}), invoice ${settled.invoiceId ?? "none"}`,
    );
  } else if (settled.outcome !== "paid" && settled.outcome !== "ignored") {
    console.info(`payment notification ${event.id} (${event.type}): ${settled.outcome}`);
  }
  return {
    status: 200,
    body: {
      received: true,
      outcome: settled.outcome,
      ...(settled.reason ? { reason: settled.reason } : {}),
    },
  };
}
