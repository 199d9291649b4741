import type { DB } from "@/db/client";
import type { Payment } from "@/db/payments";
import { tellPaymentReceived } from "@/lib/mail/events";
import type { SendOptions } from "@/lib/mail/send";
import { recordManualPayment } from "./payments";

/**
 * Money taken at the counter (cash, bank transfer, card on the shop's terminal): recorded on the
 * invoice (see recordManualPayment), then the customer is told by e-mail through the outbox (the
 * owner's switch for "payment-received" respected; the payment stands either way).
 */
export async function takeCounterPayment(
  db: DB,
  invoiceId: number,
  input: Parameters<typeof recordManualPayment>[2],
  actorId: number | null,
  options: { now?: Date; mail?: SendOptions } = {},
): Promise<{ payment: Payment; paid: boolean }> {
  const recorded = await recordManualPayment(db, invoiceId, input, actorId, options.now);
  await tellPaymentReceived(db, invoiceId, recorded.payment.amount, actorId, options.mail);
  return recorded;
}
