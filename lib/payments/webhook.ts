import Stripe from "stripe";
import type { DB } from "@/db/client";
import { invoiceExists } from "@/db/invoices";
import {
  createPaymentEvent,
  markPaymentSessionExpired,
  updatePaymentEventOutcome,
} from "@/db/payments";
import { fromMinorUnits } from "@/lib/billing/money";
import { applyOnlinePayment } from "@/lib/billing/payments";
import { tellPaymentReceived } from "@/lib/mail/events";

export interface WebhookResult {
  status: 200 | 400;
  body: { received: true; outcome: string } | { error: { code: string; message: string } };
}

function invoiceIdOf(session: Stripe.Checkout.Session): number | null {
  const raw = session.metadata?.invoiceId ?? session.client_reference_id;
  const id = Number(raw);
  return raw && Number.isSafeInteger(id) && id > 0 ? id : null;
}

/**
 * Handles one notification from the payment provider. The raw body is checked against its
 * signature before anything in it is believed; an unsigned or wrongly signed request is logged
 * and answered 400. Each event id is acted on once: a repeat delivery changes nothing, and so
 * does a second payment event for an invoice already settled.
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
    const reason = error instanceof Error ? error.message : String(error);
    console.warn(`payment notification rejected: ${reason}`);
    await createPaymentEvent(db, {
      eventId: null,
      type: null,
      outcome: "rejected",
      detail: `${signature ? "bad signature" : "unsigned"}: ${reason}`,
    });
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

  let applied = null as { invoiceId: number; amount: string } | null;
  const outcome = await db.transaction().execute(async (trx) => {
    const rowId = await createPaymentEvent(trx, {
      eventId: event.id,
      type: event.type,
      outcome: "received",
    });
    if (rowId === undefined) return "duplicate";
    let result = "ignored";
    let invoiceId: number | null = null;
    if (
      event.type === "checkout.session.completed" ||
      event.type === "checkout.session.async_payment_succeeded"
    ) {
      const session = event.data.object;
      invoiceId = invoiceIdOf(session);
      if (session.payment_status !== "paid") result = "not-paid-yet";
      else if (invoiceId === null || session.amount_total === null) result = "unknown-invoice";
      else {
        const amount = fromMinorUnits(session.amount_total);
        result = await applyOnlinePayment(
          trx,
          {
            invoiceId,
            sessionId: session.id,
            eventId: event.id,
            amount,
            currency: session.currency ?? "",
            reference:
              typeof session.payment_intent === "string" ? session.payment_intent : session.id,
          },
          now,
        );
        if (result === "paid" || result === "part-paid") applied = { invoiceId, amount };
      }
    } else if (event.type === "checkout.session.expired") {
      invoiceId = invoiceIdOf(event.data.object);
      await markPaymentSessionExpired(trx, event.data.object.id);
      result = "session-expired";
    }
    const known = invoiceId !== null && (await invoiceExists(trx, invoiceId));
    await updatePaymentEventOutcome(trx, rowId, result, known ? invoiceId : null);
    return result;
  });
  // The customer's receipt goes out once the payment is on the books (through the outbox; a mail
  // failure is logged there and never undoes the payment).
  if (applied) await tellPaymentReceived(db, applied.invoiceId, applied.amount, null);
  if (outcome !== "paid" && outcome !== "ignored") {
    console.info(`payment notification ${event.id} (${event.type}): ${outcome}`);
  }
  return { status: 200, body: { received: true, outcome } };
}
