import type { DB } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import { findJobById } from "@/db/jobs";
import type { MailLogEntry } from "@/db/mail";
import { findShopSettings } from "@/db/settings";
import { appBaseUrl } from "@/lib/env";
import { type SendOptions, type MailAttachment, sendMail } from "./send";
import { type MailFacts, renderCustomerMail, signatureOf } from "./templates";

/** What happened, with the figures the message names (money already formatted). */
export type CustomerEvent =
  | { kind: "quote-offered"; jobId: number; quoteNumber: string; total: string }
  | { kind: "invoice-issued"; jobId: number; invoiceNumber: string; total: string }
  | {
      kind: "payment-received";
      jobId: number;
      invoiceNumber: string;
      amount: string;
      owed: string | null;
    }
  | { kind: "ready-to-collect"; jobId: number }
  | {
      kind: "balance-card" | "card-reissued";
      jobId: number;
      revision: number;
      verifyUrl: string;
      attachment: MailAttachment;
    };

/** Why no message went out, or the message as the outbox recorded it (sent or failed). */
export type NotifyOutcome =
  | { sent: false; skipped: "switched-off" | "no-address" | "no-job" | "error" }
  | { sent: boolean; mail: MailLogEntry };

/**
 * Tells the job's customer by e-mail that something happened, in the shop's words and with its
 * signature, through the outbox (lib/mail/send.ts records every attempt and its state). Nothing
 * is sent when the owner switched the kind off or the customer has no e-mail address. Never
 * throws: the quote, invoice, payment or job change it reports has already happened, and a
 * message that could not be sent waits in the outbox for a retry.
 */
export async function notifyCustomer(
  db: DB,
  event: CustomerEvent,
  actorId: number | null,
  options: SendOptions = {},
): Promise<NotifyOutcome> {
  try {
    const counter = await findCounterSettings(db);
    if (counter.mailOff.includes(event.kind)) return { sent: false, skipped: "switched-off" };
    const job = await findJobById(db, event.jobId);
    if (!job) return { sent: false, skipped: "no-job" };
    const customer = await findCustomerById(db, job.customerId);
    if (!customer?.email) return { sent: false, skipped: "no-address" };
    const shop = await findShopSettings(db);
    const base = appBaseUrl();
    const billing = ["quote-offered", "invoice-issued", "payment-received"].includes(event.kind);
    const facts = {
      ...event,
      customerName: customer.name,
      jobNumber: job.number,
      engine: job.engine,
      link: `${base}/jobs/${job.id}${billing ? "/billing" : ""}`,
      shopName: shop.shopName,
      signature: signatureOf(shop, counter.signature),
      promised: job.spec.promisedDate,
    } as MailFacts;
    const content = renderCustomerMail(facts);
    const mail = await sendMail(
      db,
      {
        kind: event.kind,
        jobId: job.id,
        to: customer.email,
        createdBy: actorId,
        ...content,
        ...("attachment" in event ? { attachments: [event.attachment] } : {}),
      },
      options,
    );
    return { sent: mail.status === "sent", mail };
  } catch (error) {
    console.error(`e-mail to the customer (${event.kind}) could not be prepared`, error);
    return { sent: false, skipped: "error" };
  }
}
