import type SMTPTransport from "nodemailer/lib/smtp-transport";
import type { DB } from "@/db/client";
import {
  claimMailForRetry,
  insertMail,
  findMailById,
  findMailForSending,
  markMailFailed,
  markMailSent,
  type MailForSending,
  type MailLogEntry,
  type MailSender,
} from "@/db/mail";
import { findCounterSettings } from "@/db/counter-settings";
import { findShopSettings } from "@/db/settings";
import { env } from "@/lib/env";
import { HttpError } from "@/lib/http/errors";
import { emailField } from "@/lib/validation/users";
import { createMailTransport, type MailTransport } from "./transport";

export interface MailAttachment {
  filename: string;
  content: Buffer;
  contentType: string;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: MailAttachment[];
  /** The job the message is about, so it shows with the job. */
  jobId?: number | null;
  /** What the message is for, shown in the outbox: "invite", "balance-card", "invoice", … */
  kind: string;
  /** The user who caused it to be sent. */
  createdBy?: number | null;
  /** It holds a one-time link: the log keeps its text only until the server has accepted it. */
  oneTime?: boolean;
}

export interface SendOptions {
  /** Another transport than the one SMTP_URL describes (tests, scripts). */
  transport?: MailTransport;
  now?: () => Date;
}

// A message still "queued" this long after its last change was interrupted (the process stopped).
const STALE_QUEUED_MS = 5 * 60_000;

/**
 * Records the message in the mail log as queued, hands it to the SMTP server, and marks it sent
 * only if the server accepted it; otherwise failed, with the error and the server's reply. A
 * failed delivery is a value, not a throw: look at `status`. Only a bad address throws (422).
 *
 * @example
 * await sendMail(db, {
 *   kind: "balance-card", jobId: job.id, to: customer.email, subject: "Balance card 2026-0007",
 *   text: "…", attachments: [{ filename: "balance-card-2026-0007.pdf", content: pdf, contentType: "application/pdf" }],
 * });
 */
export async function sendMail(
  db: DB,
  mail: OutgoingMail,
  options: SendOptions = {},
): Promise<MailLogEntry> {
  const to = emailField.safeParse(mail.to);
  if (!to.success) {
    throw new HttpError(422, "invalid_input", "Enter a valid e-mail address.", {
      to: "Enter a valid e-mail address.",
    });
  }
  // The message and its attachments are logged together, or not at all.
  const entry = await db.transaction().execute((trx) =>
    insertMail(trx, {
      kind: mail.kind,
      to: to.data,
      subject: mail.subject,
      text: mail.text,
      html: mail.html ?? null,
      attachments: mail.attachments,
      jobId: mail.jobId ?? null,
      createdBy: mail.createdBy ?? null,
      oneTime: mail.oneTime ?? false,
    }),
  );
  return deliver(
    db,
    {
      entry,
      text: mail.text,
      html: mail.html ?? null,
      attachments: mail.attachments ?? [],
    },
    options,
  );
}

/**
 * Sends a failed message again, exactly as it was recorded. 404 if there is no such message,
 * 409 if it was already sent (or another attempt is under way), 410 if its text was removed.
 */
export async function retryMail(
  db: DB,
  id: number,
  options: SendOptions = {},
): Promise<MailLogEntry> {
  const now = options.now?.() ?? new Date();
  const stored = await findMailForSending(db, id);
  if (!stored) throw new HttpError(404, "not_found", "No such message.");
  if (stored.entry.bodyRemoved) {
    throw new HttpError(410, "gone", "This message's text was removed; send a new one instead.");
  }
  const staleBefore = new Date(now.getTime() - STALE_QUEUED_MS).toISOString();
  if (!(await claimMailForRetry(db, id, staleBefore, now))) {
    const current = await findMailById(db, id);
    throw new HttpError(
      409,
      current?.status === "sent" ? "already_sent" : "in_progress",
      current?.status === "sent"
        ? "This message has already been sent."
        : "This message is being sent right now.",
    );
  }
  return deliver(db, stored, options);
}

async function deliver(
  db: DB,
  stored: MailForSending,
  options: SendOptions,
): Promise<MailLogEntry> {
  const transport = options.transport ?? createMailTransport();
  const { entry } = stored;
  let from: MailSender | undefined; // kept on the message for the outbox
  try {
    const sender = await shopSender(db);
    from = {
      from:
        typeof sender.from === "string"
          ? sender.from
          : `${sender.from.name} <${sender.from.address}>`,
      replyTo: sender.replyTo,
    };
    const info: SMTPTransport.SentMessageInfo = await transport.sendMail({
      from: sender.from,
      ...(sender.replyTo ? { replyTo: sender.replyTo } : {}),
      to: entry.to,
      subject: entry.subject,
      text: stored.text,
      ...(stored.html ? { html: stored.html } : {}),
      attachments: stored.attachments.map((a) => ({
        filename: a.filename,
        content: a.content,
        contentType: a.contentType,
      })),
    });
    const accepted = info.accepted.map(String).map((a) => a.toLowerCase());
    if (info.rejected.length > 0 || !accepted.includes(entry.to)) {
      return markMailFailed(
        db,
        entry.id,
        {
          error: `The server did not accept ${entry.to}.`,
          serverResponse: info.response ?? null,
          sender: from,
        },
        options.now?.(),
      );
    }
    return markMailSent(
      db,
      entry.id,
      { messageId: info.messageId ?? null, serverResponse: info.response ?? null, sender: from },
      options.now?.(),
    );
  } catch (error) {
    return markMailFailed(
      db,
      entry.id,
      { ...describeFailure(error), sender: from },
      options.now?.(),
    );
  } finally {
    if (!options.transport) transport.close();
  }
}

/**
 * Who the shop's e-mails come from: the sender name from the counter settings (else the shop's
 * name) at MAIL_FROM's address (the one the mail server may send from), and replies to the
 * counter settings' reply-to (else the shop's e-mail). MAIL_FROM as it is when the shop has no
 * name of its own yet.
 */
async function shopSender(
  db: DB,
): Promise<{ from: string | { name: string; address: string }; replyTo: string | null }> {
  const [counter, shop] = await Promise.all([findCounterSettings(db), findShopSettings(db)]);
  const configured = env().MAIL_FROM;
  const address = /<([^>]+)>\s*$/.exec(configured)?.[1]?.trim() ?? configured.trim();
  const name = counter.senderName?.trim() || (shop.version > 0 ? shop.shopName.trim() : "");
  return {
    from: name ? { name, address } : configured,
    replyTo: counter.replyTo?.trim() || shop.email?.trim() || null,
  };
}

/** nodemailer's errors carry a code (ECONNECTION, EENVELOPE…) and the server's reply. */
function describeFailure(error: unknown): { error: string; serverResponse: string | null } {
  if (!(error instanceof Error)) return { error: String(error), serverResponse: null };
  const detail = error as Error & { code?: unknown; response?: unknown; responseCode?: unknown };
  const code = typeof detail.code === "string" ? `${detail.code}: ` : "";
  return {
    error: `${code}${error.message}`.slice(0, 2000),
    serverResponse: typeof detail.response === "string" ? detail.response.slice(0, 2000) : null,
  };
}
