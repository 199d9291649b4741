import type { ColumnType, Generated, Insertable, Selectable } from "kysely";

type CreatedAt = ColumnType<string, string | undefined, never>;

export const UPLOAD_CATEGORIES = ["arrival-photo", "balancer-printout", "other"] as const;
export type UploadCategory = (typeof UPLOAD_CATEGORIES)[number];

/** The only kinds of file the shop keeps, as detected from the bytes (never from the name). */
export const UPLOAD_CONTENT_TYPES = [
  "image/jpeg",
  "image/png",
  "image/webp",
  "application/pdf",
] as const;
export type UploadContentType = (typeof UPLOAD_CONTENT_TYPES)[number];

export interface UploadTable {
  id: Generated<number>;
  job_id: number;
  category: UploadCategory;
  caption: string | null;
  original_name: string;
  content_type: UploadContentType;
  size_bytes: number;
  sha256: string;
  stored_name: string;
  thumbnail_name: string | null;
  width: number | null;
  height: number | null;
  uploaded_by: number | null;
  created_at: CreatedAt;
}

export const MAIL_STATUSES = ["queued", "sent", "failed"] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

export interface MailLogTable {
  id: Generated<number>;
  /** What the message is for: "invite", "balance-card", "invoice", … (free text, for the outbox). */
  kind: string;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string | null;
  one_time: Generated<number>;
  body_removed: Generated<number>;
  status: ColumnType<MailStatus, MailStatus | undefined, MailStatus>;
  attempts: Generated<number>;
  last_error: string | null;
  server_response: string | null;
  message_id: string | null;
  job_id: number | null;
  created_by: number | null;
  created_at: CreatedAt;
  updated_at: ColumnType<string, string | undefined, string>;
  sent_at: string | null;
  /** The From of the last attempt ("Name <address>" or the address), null before any. */
  from_address: ColumnType<string | null, string | null | undefined, string | null>;
  /** The Reply-To of the last attempt, null when there was none. */
  reply_to: ColumnType<string | null, string | null | undefined, string | null>;
}

export interface MailAttachmentTable {
  id: Generated<number>;
  mail_id: number;
  position: number;
  filename: string;
  content_type: string;
  size_bytes: number;
  content: Buffer;
}

export interface InviteTable {
  id: Generated<number>;
  customer_id: number;
  email: string;
  /** The customer account made when the link was used. */
  user_id: number | null;
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
  mail_id: number | null;
  created_by: number | null;
  created_at: CreatedAt;
}

/** The uploads and mail tables; `Database` in db/schema.ts extends this. */
export interface UploadsAndMailTables {
  uploads: UploadTable;
  mail_log: MailLogTable;
  mail_attachments: MailAttachmentTable;
  invites: InviteTable;
}

export type UploadRow = Selectable<UploadTable>;
export type NewUploadRow = Insertable<UploadTable>;
export type MailLogRow = Selectable<MailLogTable>;
export type MailAttachmentRow = Selectable<MailAttachmentTable>;
export type InviteRow = Selectable<InviteTable>;
