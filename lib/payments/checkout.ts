import type { DB } from "@/db/client";
import type { User } from "@/db/users";
import { findInvoiceForUser } from "@/lib/billing/access";
import { BillingInputError } from "@/lib/billing/errors";
import { createPaymentSession } from "@/lib/billing/payments";
import { compareMoney, subtractMoney, toMinorUnits } from "@/lib/billing/money";
import { appBaseUrl } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import { stripeClient } from "./stripe";

/** The provider's ceiling for one Checkout payment, in minor units (999,999.99). */
const MAX_ONLINE_AMOUNT = 99_999_999;

export interface CheckoutStart {
  sessionId: string;
  url: string;
  amount: string;
  currency: string;
}

/**
 * Opens a hosted payment page for what is still owed on an issued invoice. A customer may do it
 * for their own invoices only (anyone else's is a 404); the invoice is marked paid later, by the
 * provider's signed notification, never by the redirect back.
 */
export async function startCheckout(
  db: DB,
  invoiceId: number,
  user: User,
  requestUrl: string,
): Promise<CheckoutStart> {
  const invoice = await findInvoiceForUser(db, invoiceId, user);
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
  const cents = toMinorUnits(owed);
  if (cents > MAX_ONLINE_AMOUNT) {
    throw new BillingInputError(
      "amount",
      "Too large to pay online: record the payment at the counter.",
    );
  }
  // The payment page sends people back to the app's public address, where their session cookie is.
  const base = appBaseUrl(requestUrl);
  const back = `${base}/pay/return?invoice=${invoice.id}`;
  let session;
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
    console.error("payment provider refused or unreachable", error);
    throw new HttpError(
      502,
      "payment_provider",
      "The payment service could not be reached. Try again shortly.",
    );
  }
  if (!session.url) {
    throw new HttpError(502, "payment_provider", "The payment service gave no payment page.");
  }
  await createPaymentSession(
    db,
    { id: session.id, invoiceId: invoice.id, amount: owed, currency: invoice.currency },
    user.id,
  );
  return { sessionId: session.id, url: session.url, amount: owed, currency: invoice.currency };
}
