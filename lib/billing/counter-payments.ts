import type { DB } from "@/db/client";
import type { Payment } from "@/db/payments";
import { tellPaymentReceived } from "@/lib/mail/events";
import type { SendOptions } from "@/lib/mail/send";
import { closeInvoicePaymentPages } from "@/lib/payments/close-pages";
import { recordManualPayment } from "./payments";

/**
 * Money taken at the counter (cash, bank transfer, card on the shop's terminal): recorded on the
 * invoice (see recordManualPayment), then the customer is told by e-mail through the outbox (the
 * owner's switch for "payment-received" respected; the payment stands either way). Any payment
 * page still open online for the invoice is closed at the provider, so the customer cannot pay
 * the old amount after; when the provider cannot be reached that is recorded and retried at the
 * next checkout, and the counter's payment stands.
 */
export async function takeCounterPayment(
  db: DB,
  invoiceId: number,
  input: Parameters<typeof recordManualPayment>[2],
  actorId: number | null,
  options: { now?: Date; mail?: SendOptions } = {},
): Promise<{ payment: Payment; paid: boolean }> {
  const recorded = await recordManualPayment(db, invoiceId, input, actorId, options.now);
  await closeInvoicePaymentPages(db, invoiceId); // never throws
  await tellPaymentReceived(db, invoiceId, recorded.payment.amount, actorId, options.mail);
  return recorded;
}
