import type { Kysely } from "kysely";
import { NotFoundError } from "./errors";
import type { Database } from "./schema";
import type { MailLogRow, MailStatus } from "./uploads-schema";

export interface MailAttachmentInfo {
  filename: string;
  contentType: string;
  sizeBytes: number;
}

/** One message the app tried to send, and how that went. */
export interface MailLogEntry {
  id: number;
  kind: string;
  to: string;
  subject: string;
  status: MailStatus;
  attempts: number;
  lastError: string | null;
  serverResponse: string | null;
  messageId: string | null;
  jobId: number | null;
  createdBy: number | null;
  createdAt: string;
  updatedAt: string;
  sentAt: string | null;
  oneTime: boolean;
  bodyRemoved: boolean;
  attachments: MailAttachmentInfo[];
}

/** Everything needed to hand the message to the SMTP server again. */
export interface MailForSending {
  entry: MailLogEntry;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; content: Buffer }[];
}

function toEntry(row: MailLogRow, attachments: MailAttachmentInfo[]): MailLogEntry {
  return {
    id: row.id,
    kind: row.kind,
    to: row.to_address,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    lastError: row.last_error,
    serverResponse: row.server_response,
    messageId: row.message_id,
    jobId: row.job_id,
    createdBy: row.created_by,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    sentAt: row.sent_at,
    oneTime: row.one_time === 1,
    bodyRemoved: row.body_removed === 1,
    attachments,
  };
}

async function attachmentInfo(
  db: Kysely<Database>,
  mailIds: number[],
): Promise<Map<number, MailAttachmentInfo[]>> {
  const byMail = new Map<number, MailAttachmentInfo[]>();
  if (mailIds.length === 0) return byMail;
  const rows = await db
    .selectFrom("mail_attachments")
    .select(["mail_id", "filename", "content_type", "size_bytes"])
    .where("mail_id", "in", mailIds)
    .orderBy("mail_id")
    .orderBy("position")
    .execute();
  for (const r of rows) {
    const list = byMail.get(r.mail_id) ?? [];
    list.push({ filename: r.filename, contentType: r.content_type, sizeBytes: r.size_bytes });
    byMail.set(r.mail_id, list);
  }
  return byMail;
}

export interface NewMail {
  kind: string;
  to: string;
  subject: string;
  text: string;
  html?: string | null;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
  jobId?: number | null;
  createdBy?: number | null;
  /** It holds a one-time link: its bodies are removed from the log once it has been sent. */
  oneTime?: boolean;
}

/**
 * Records a message as queued, with its attachments, before anything is sent (two inserts: the
 * caller runs them in one transaction, lib/mail/send.ts).
 */
export async function insertMail(db: Kysely<Database>, input: NewMail): Promise<MailLogEntry> {
  const row = await db
    .insertInto("mail_log")
    .values({
      kind: input.kind,
      to_address: input.to,
      subject: input.subject,
      text_body: input.text,
      html_body: input.html ?? null,
      job_id: input.jobId ?? null,
      created_by: input.createdBy ?? null,
      one_time: input.oneTime ? 1 : 0,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
  const attachments = input.attachments ?? [];
  if (attachments.length > 0) {
    await db
      .insertInto("mail_attachments")
      .values(
        attachments.map((a, position) => ({
          mail_id: row.id,
          position,
          filename: a.filename,
          content_type: a.contentType,
          size_bytes: a.content.length,
          content: a.content,
        })),
      )
      .execute();
  }
  return toEntry(
    row,
    attachments.map((a) => ({
      filename: a.filename,
      contentType: a.contentType,
      sizeBytes: a.content.length,
    })),
  );
}

export async function findMailById(
  db: Kysely<Database>,
  id: number,
): Promise<MailLogEntry | undefined> {
  const row = await db.selectFrom("mail_log").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  return toEntry(row, (await attachmentInfo(db, [id])).get(id) ?? []);
}

export async function findMailForSending(
  db: Kysely<Database>,
  id: number,
): Promise<MailForSending | undefined> {
  const row = await db.selectFrom("mail_log").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  const files = await db
    .selectFrom("mail_attachments")
    .select(["filename", "content_type", "size_bytes", "content"])
    .where("mail_id", "=", id)
    .orderBy("position")
    .execute();
  return {
    entry: toEntry(
      row,
      files.map((f) => ({
        filename: f.filename,
        contentType: f.content_type,
        sizeBytes: f.size_bytes,
      })),
    ),
    text: row.text_body,
    html: row.html_body,
    attachments: files.map((f) => ({
      filename: f.filename,
      contentType: f.content_type,
      content: Buffer.from(f.content),
    })),
  };
}

/**
 * Takes a failed message (or one stuck as queued since before `staleBefore`) back to queued for
 * another attempt. False when it is not in such a state: already sent, or being sent right now.
 */
export async function claimMailForRetry(
  db: Kysely<Database>,
  id: number,
  staleBefore: string,
  now = new Date(),
): Promise<boolean> {
  const result = await db
    .updateTable("mail_log")
    .set({ status: "queued", updated_at: now.toISOString() })
    .where("id", "=", id)
    .where((eb) =>
      eb.or([
        eb("status", "=", "failed"),
        eb.and([eb("status", "=", "queued"), eb("updated_at", "<", staleBefore)]),
      ]),
    )
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

/** Who an attempt went out as (stored on the message for the outbox). */
export interface MailSender {
  from: string;
  replyTo: string | null;
}

export interface SentOutcome {
  messageId: string | null;
  serverResponse: string | null;
  sender?: MailSender;
}

const REMOVED_BODY = "[Removed once sent: this message held a one-time link.]";

export async function markMailSent(
  db: Kysely<Database>,
  id: number,
  outcome: SentOutcome,
  now = new Date(),
): Promise<MailLogEntry> {
  const at = now.toISOString();
  await db
    .updateTable("mail_log")
    .set((eb) => ({
      status: "sent",
      attempts: eb("attempts", "+", 1),
      last_error: null,
      server_response: outcome.serverResponse,
      message_id: outcome.messageId,
      ...(outcome.sender
        ? { from_address: outcome.sender.from, reply_to: outcome.sender.replyTo }
        : {}),
      sent_at: at,
      updated_at: at,
      text_body: eb
        .case()
        .when("one_time", "=", 1)
        .then(REMOVED_BODY)
        .else(eb.ref("text_body"))
        .end(),
      html_body: eb.case().when("one_time", "=", 1).then(null).else(eb.ref("html_body")).end(),
      body_removed: eb.ref("one_time"),
    }))
    .where("id", "=", id)
    .execute();
  const entry = await findMailById(db, id);
  if (!entry) throw new NotFoundError("mail");
  return entry;
}

export async function markMailFailed(
  db: Kysely<Database>,
  id: number,
  outcome: { error: string; serverResponse: string | null; sender?: MailSender },
  now = new Date(),
): Promise<MailLogEntry> {
  await db
    .updateTable("mail_log")
    .set((eb) => ({
      status: "failed",
      attempts: eb("attempts", "+", 1),
      last_error: outcome.error,
      server_response: outcome.serverResponse,
      ...(outcome.sender
        ? { from_address: outcome.sender.from, reply_to: outcome.sender.replyTo }
        : {}),
      updated_at: now.toISOString(),
    }))
    .where("id", "=", id)
    .where("status", "!=", "sent")
    .execute();
  const entry = await findMailById(db, id);
  if (!entry) throw new NotFoundError("mail");
  return entry;
}

export interface MailLogQuery {
  status?: MailStatus;
  jobId?: number;
  limit?: number;
}

/** The newest messages first, with their attachments' names and sizes (not their bytes). */
export async function listMailLog(
  db: Kysely<Database>,
  query: MailLogQuery = {},
): Promise<MailLogEntry[]> {
  let q = db.selectFrom("mail_log").selectAll();
  if (query.status) q = q.where("status", "=", query.status);
  if (query.jobId !== undefined) q = q.where("job_id", "=", query.jobId);
  const rows = await q
    .orderBy("id", "desc")
    .limit(query.limit ?? 100)
    .execute();
  const info = await attachmentInfo(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => toEntry(r, info.get(r.id) ?? []));
}

/** A message as the outbox shows it: the log entry with its sender and bodies. */
export interface OutboxMessage extends MailLogEntry {
  /** The From of the last attempt; null before any attempt (or logged before it was kept). */
  from: string | null;
  replyTo: string | null;
  text: string;
  html: string | null;
}

/** The newest messages first, with sender, bodies and attachments' names (not their bytes). */
export async function listOutboxMessages(
  db: Kysely<Database>,
  query: MailLogQuery = {},
): Promise<OutboxMessage[]> {
  let q = db.selectFrom("mail_log").selectAll();
  if (query.status) q = q.where("status", "=", query.status);
  if (query.jobId !== undefined) q = q.where("job_id", "=", query.jobId);
  const rows = await q
    .orderBy("id", "desc")
    .limit(query.limit ?? 100)
    .execute();
  const info = await attachmentInfo(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => ({
    ...toEntry(r, info.get(r.id) ?? []),
    from: r.from_address,
    replyTo: r.reply_to,
    text: r.text_body,
    html: r.html_body,
  }));
}
