import type Stripe from "stripe";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Invoice } from "@/db/invoices";
import type { User } from "@/db/users";
import {
  insertPaymentSession,
  listOpenPaymentSessions,
  markPaymentSessionExpired,
  type PaymentSession,
} from "@/db/payments";
import { findInvoiceForUser } from "@/lib/billing/access";
import { BillingInputError } from "@/lib/billing/errors";
import { compareMoney, subtractMoney, toMinorUnits } from "@/lib/billing/money";
import { lockInvoice } from "@/lib/billing/payments";
import { appBaseUrl } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import { closeAtProvider, retryPaymentPageClosures } from "./close-pages";
import { stripeClient } from "./stripe";

/** The provider's ceiling for one Checkout payment, in minor units (999,999.99). */
const MAX_ONLINE_AMOUNT = 99_999_999;

/** A payment page is offered again only while it has at least this long to run. */
const REUSE_MARGIN_MS = 15 * 60 * 1000;

export interface CheckoutStart {
  sessionId: string;
  url: string;
  amount: string;
  currency: string;
}

function owedOn(invoice: Invoice): string {
  if (invoice.status !== "issued") {
    throw new HttpError(
      409,
      "not_payable",
      `This invoice is ${invoice.status}: there is nothing to pay.`,
    );
  }
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  if (compareMoney(owed, "0") <= 0) {
    throw new HttpError(409, "not_payable", "Nothing is owed on this invoice.");
  }
  return owed;
}

/** An open session that asks for exactly what is owed now and has time left to run. */
function reusable(
  sessions: PaymentSession[],
  owed: string,
  currency: string,
  now: Date,
): PaymentSession | undefined {
  return sessions.find(
    (s) =>
      s.url !== null &&
      s.currency === currency &&
      compareMoney(s.amount, owed) === 0 &&
      s.expiresAt !== null &&
      Date.parse(s.expiresAt) - now.getTime() > REUSE_MARGIN_MS,
  );
}

const started = (s: PaymentSession): CheckoutStart => ({
  sessionId: s.id,
  url: s.url!,
  amount: s.amount,
  currency: s.currency,
});

function unreachable(error: unknown): HttpError {
  console.error("payment provider refused or unreachable", error);
  return new HttpError(
    502,
    "payment_provider",
    "The payment service could not be reached. Try again shortly.",
  );
}

/**
 * Closes a payment page at the provider, then on our side. One the provider says is already
 * expired is closed here too; one it says was paid meanwhile stops the new checkout (409
 * `payment_in_progress`): its notification is on the way and will be applied or kept to
 * reconcile, and a second page must not be opened beside it.
 */
async function expireAtProvider(db: DB, sessionId: string): Promise<void> {
  const result = await closeAtProvider(sessionId);
  if (result.kind === "complete") {
    throw new HttpError(
      409,
      "payment_in_progress",
      "A payment on this invoice was just made online and is being recorded. Look again in a minute.",
    );
  }
  if (result.kind === "failed") throw unreachable(result.error);
  await markPaymentSessionExpired(db, sessionId);
}

/**
 * Opens a hosted payment page for what is still owed on an issued invoice, or offers again the one
 * already open for that invoice and amount: a customer who presses Pay twice gets the same page,
 * so they cannot be charged twice. When what is owed changed since a page was opened (money taken
 * at the counter), that page is closed at the provider first and a new one opened. Two checkouts at
 * once end with one open page: the second finds the first's under the invoice's lock and closes its
 * own. Any page whose closing failed earlier (see closeInvoicePaymentPages) is tried again first. A customer may do it for their own invoices only (anyone else's is a 404); the invoice is
 * marked paid later, by the provider's signed notification, never by the redirect back.
 *
 * @throws HttpError 409 `not_payable` (not issued, nothing owed), 409 `payment_in_progress`,
 *   409 `amount_changed` (what is owed changed while the page was opening), 502 `payment_provider`.
 * @throws BillingInputError when the amount is over what the provider takes online.
 */
export async function startCheckout(
  db: DB,
  invoiceId: number,
  user: User,
  requestUrl: string,
  now = new Date(),
): Promise<CheckoutStart> {
  const visible = await findInvoiceForUser(db, invoiceId, user);
  owedOn(visible);
  // Pages that money at the counter or a void should have closed, when the provider was out of reach.
  await retryPaymentPageClosures(db);

  // What is open now, read under the invoice's lock.
  const plan = await db.transaction().execute(async (trx) => {
    const invoice = (await lockInvoice(trx, visible.id))!;
    const owed = owedOn(invoice);
    const open = await listOpenPaymentSessions(trx, invoice.id);
    const reuse = reusable(open, owed, invoice.currency, now);
    return { invoice, owed, reuse, stale: open.filter((s) => s !== reuse) };
  });
  if (plan.reuse) return started(plan.reuse);
  const { invoice, owed } = plan;

  const cents = toMinorUnits(owed);
  if (cents > MAX_ONLINE_AMOUNT) {
    throw new BillingInputError(
      "amount",
      "Too large to pay online: record the payment at the counter.",
    );
  }
  for (const s of plan.stale) await expireAtProvider(db, s.id);

  // The payment page sends people back to the app's public address, where their session cookie is.
  const base = appBaseUrl(requestUrl);
  const back = `${base}/pay/return?invoice=${invoice.id}`;
  let session: Stripe.Checkout.Session;
  try {
    session = await stripeClient().checkout.sessions.create({
      mode: "payment",
      line_items: [
        {
          quantity: 1,
          price_data: {
            currency: invoice.currency.toLowerCase(),
            unit_amount: cents,
            product_data: {
              name: `Invoice ${invoice.number}`,
              description: `Job ${invoice.jobNumber} · ${invoice.customerName}`,
            },
          },
        },
      ],
      success_url: `${back}&result=success&session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${back}&result=cancelled`,
      client_reference_id: String(invoice.id),
      metadata: { invoiceId: String(invoice.id), invoiceNumber: invoice.number ?? "" },
    });
  } catch (error) {
    throw unreachable(error);
  }
  if (!session.url) {
    throw new HttpError(502, "payment_provider", "The payment service gave no payment page.");
  }
  const url = session.url;

  // Store it, unless another checkout stored one for the same amount meanwhile (then ours goes).
  const outcome = await db.transaction().execute(async (trx) => {
    const current = (await lockInvoice(trx, invoice.id))!;
    const owedNow =
      current.status === "issued" ? subtractMoney(current.total, current.amountPaid) : null;
    const open = await listOpenPaymentSessions(trx, invoice.id);
    const winner = owedNow === null ? undefined : reusable(open, owedNow, current.currency, now);
    if (winner) return { kind: "other" as const, session: winner };
    if (owedNow === null || compareMoney(owedNow, owed) !== 0) return { kind: "changed" as const };
    const stored = await insertPaymentSession(
      trx,
      {
        id: session.id,
        invoiceId: invoice.id,
        amount: owed,
        currency: invoice.currency,
        url,
        expiresAt: session.expires_at ? new Date(session.expires_at * 1000).toISOString() : null,
      },
      user.id,
    );
    await createAuditEntry(trx, {
      userId: user.id,
      action: "checkout-started",
      entity: "invoice",
      entityId: invoice.id,
      after: {
        sessionId: stored.id,
        amount: stored.amount,
        currency: stored.currency,
        closed: plan.stale.map((s) => s.id),
      },
    });
    return { kind: "stored" as const, session: stored };
  });
  if (outcome.kind === "stored") return started(outcome.session);
  // Ours is not stored: close it at the provider so nobody can pay it.
  await stripeClient()
    .checkout.sessions.expire(session.id)
    .catch((error: unknown) => console.error(`could not close payment page ${session.id}`, error));
  if (outcome.kind === "other") return started(outcome.session);
  throw new HttpError(
    409,
    "amount_changed",
    "What is owed on this invoice changed while the payment page was opening. Try again.",
  );
}
