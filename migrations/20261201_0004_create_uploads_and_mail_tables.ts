import { type Kysely, sql } from "kysely";
import { bytesType, idColumn, nowText } from "./support/dialect";

export async function up(db: Kysely<any>): Promise<void> {
  const ID = idColumn(db);
  const NOW = nowText(db);
  const BYTES = bytesType(db);
  // Files attached to a job. The stored names are ours (random); the uploader's name is display only.
  await db.schema
    .createTable("uploads")
    .addColumn("id", "integer", ID)
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("category", "text", (c) =>
      c.notNull().check(sql`category in ('arrival-photo','balancer-printout','other')`),
    )
    .addColumn("caption", "text")
    .addColumn("original_name", "text", (c) => c.notNull())
    .addColumn("content_type", "text", (c) =>
      c
        .notNull()
        .check(sql`content_type in ('image/jpeg','image/png','image/webp','application/pdf')`),
    )
    .addColumn("size_bytes", "integer", (c) => c.notNull().check(sql`size_bytes > 0`))
    .addColumn("sha256", "text", (c) => c.notNull())
    .addColumn("stored_name", "text", (c) => c.notNull().unique())
    .addColumn("thumbnail_name", "text", (c) => c.unique())
    .addColumn("width", "integer")
    .addColumn("height", "integer")
    .addColumn("uploaded_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema.createIndex("uploads_job").on("uploads").columns(["job_id", "id"]).execute();

  // Every message the app tries to send, with what the SMTP server said.
  await db.schema
    .createTable("mail_log")
    .addColumn("id", "integer", ID)
    .addColumn("kind", "text", (c) => c.notNull())
    .addColumn("to_address", "text", (c) => c.notNull())
    .addColumn("subject", "text", (c) => c.notNull())
    .addColumn("text_body", "text", (c) => c.notNull())
    .addColumn("html_body", "text")
    // A message holding a one-time link keeps its bodies only until it has been sent.
    .addColumn("one_time", "integer", (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`one_time in (0,1)`),
    )
    .addColumn("body_removed", "integer", (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`body_removed in (0,1)`),
    )
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("queued")
        .check(sql`status in ('queued','sent','failed')`),
    )
    .addColumn("attempts", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("last_error", "text")
    .addColumn("server_response", "text")
    .addColumn("message_id", "text")
    .addColumn("job_id", "integer", (c) => c.references("jobs.id").onDelete("set null"))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("sent_at", "text")
    .execute();
  await db.schema.createIndex("mail_log_status").on("mail_log").columns(["status", "id"]).execute();
  await db.schema.createIndex("mail_log_job").on("mail_log").columns(["job_id", "id"]).execute();

  // Attachments are kept with the message so a failed one can be sent again as it was.
  await db.schema
    .createTable("mail_attachments")
    .addColumn("id", "integer", ID)
    .addColumn("mail_id", "integer", (c) =>
      c.notNull().references("mail_log.id").onDelete("cascade"),
    )
    .addColumn("position", "integer", (c) => c.notNull())
    .addColumn("filename", "text", (c) => c.notNull())
    .addColumn("content_type", "text", (c) => c.notNull())
    .addColumn("size_bytes", "integer", (c) => c.notNull())
    .addColumn("content", BYTES, (c) => c.notNull())
    .addUniqueConstraint("mail_attachments_order", ["mail_id", "position"])
    .execute();

  // One-time links for a customer to set a password; the account is made when the link is used.
  // Only the SHA-256 of the token is kept.
  await db.schema
    .createTable("invites")
    .addColumn("id", "integer", ID)
    .addColumn("customer_id", "integer", (c) =>
      c.notNull().references("customers.id").onDelete("cascade"),
    )
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("user_id", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("token_hash", "text", (c) => c.notNull().unique())
    .addColumn("expires_at", "text", (c) => c.notNull())
    .addColumn("used_at", "text")
    .addColumn("revoked_at", "text")
    .addColumn("mail_id", "integer", (c) => c.references("mail_log.id").onDelete("set null"))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema.createIndex("invites_email").on("invites").columns(["email", "id"]).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("invites").execute();
  await db.schema.dropTable("mail_attachments").execute();
  await db.schema.dropTable("mail_log").execute();
  await db.schema.dropTable("uploads").execute();
}
