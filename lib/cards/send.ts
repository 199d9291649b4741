import type { DB } from "@/db/client";
import { createAuditEntry } from "@/db/audit";
import { findCard, findCardPdf } from "@/db/cards";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById } from "@/db/customers";
import type { MailLogEntry } from "@/db/mail";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";
import { type SendOptions, sendMail } from "@/lib/mail/send";
import { renderCustomerMail, signatureOf } from "@/lib/mail/templates";
import type { SendCardInput } from "@/lib/validation/cards";
import { formatCode } from "./code";
import { CARD_MAIL_KIND } from "./list";
import { appBaseUrl, cardFileName, cardVerifyUrl } from "./urls";

export interface CardSendResult {
  /** True only when the SMTP server accepted the message. */
  sent: boolean;
  mail: {
    id: number;
    to: string;
    status: MailLogEntry["status"];
    error: string | null;
    sentAt: string | null;
  };
}

/**
 * E-mails one revision of a job's card, attached, to the customer's address (or the one given),
 * through the mail log: it is marked sent only if the SMTP server accepted it. The outcome is
 * also written to the job's audit history. A failed delivery is a result, not a throw.
 *
 * @throws HttpError 404 for an unknown job or revision, 422 when there is no address to send to
 */
export async function sendCardByMail(
  db: DB,
  jobId: number,
  revision: number,
  actor: User,
  input: SendCardInput,
  options: SendOptions = {},
): Promise<CardSendResult> {
  const job = await findJobForUser(db, jobId, actor);
  const [card, pdf, customer, settings] = await Promise.all([
    findCard(db, job.id, revision),
    findCardPdf(db, job.id, revision),
    findCustomerById(db, job.customerId),
    findShopSettings(db),
  ]);
  if (!card || !pdf) throw new HttpError(404, "not_found", "No such card revision.");
  const to = input.to ?? customer?.email ?? null;
  if (!to) {
    const message = "This customer has no e-mail address: enter one.";
    throw new HttpError(422, "invalid_input", message, { to: message });
  }

  const code = formatCode(card.verificationCode);
  const standing = card.supersededAt
    ? `This is revision ${card.revision}; it has been replaced by revision ${card.supersededByRevision}.`
    : `This is revision ${card.revision}, the current card for the job.`;
  // The shop's template and signature (lib/mail/templates.ts), with the sender's own words.
  const content = renderCustomerMail({
    kind: "balance-card",
    customerName: customer?.name ?? job.customerName,
    jobNumber: job.number,
    engine: job.engine,
    link: `${appBaseUrl()}/jobs/${job.id}`,
    shopName: settings.shopName,
    signature: signatureOf(settings, (await findCounterSettings(db)).signature),
    note: input.message ?? null,
    revision: card.revision,
    verifyUrl: `${cardVerifyUrl(card.verificationCode)} (verification code ${code})`,
    standing,
  });

  const entry = await sendMail(
    db,
    {
      kind: CARD_MAIL_KIND,
      jobId: job.id,
      createdBy: actor.id,
      to,
      ...content,
      attachments: [
        {
          filename: cardFileName(job.number, card.revision),
          content: pdf,
          contentType: "application/pdf",
        },
      ],
    },
    options,
  );
  const result: CardSendResult = {
    sent: entry.status === "sent",
    mail: {
      id: entry.id,
      to: entry.to,
      status: entry.status,
      error: entry.lastError,
      sentAt: entry.sentAt,
    },
  };
  await createAuditEntry(db, {
    userId: actor.id,
    action: result.sent ? "email-card" : "email-card-failed",
    entity: "job",
    entityId: job.id,
    after: { revision: card.revision, ...result.mail },
  });
  return result;
}
