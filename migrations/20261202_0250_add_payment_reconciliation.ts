import { type Kysely, sql } from "kysely";
import { idColumn } from "./support/dialect";

// Online payments that reached us and were not put on an invoice (a second payment for an invoice
// already paid, more than is owed, for a void invoice, from a payment page that was closed, or
// one no payment page of ours matches): kept until the counter applies or refunds each one.
// Checkout sessions keep their payment page's address and when it lapses, so an open one is
// offered again instead of a second one being opened.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("payment_sessions").addColumn("url", "text").execute();
  await db.schema.alterTable("payment_sessions").addColumn("expires_at", "text").execute();

  await db.schema
    .createTable("unapplied_payments")
    .addColumn("id", "integer", idColumn(db))
    .addColumn("event_id", "text", (c) => c.notNull())
    .addColumn("session_id", "text", (c) => c.notNull().unique())
    .addColumn("invoice_id", "integer", (c) => c.references("invoices.id").onDelete("set null"))
    .addColumn("amount", "text", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("reason", "text", (c) => c.notNull())
    .addColumn("reference", "text")
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("open")
        .check(sql`status in ('open','applied','refunded')`),
    )
    .addColumn("note", "text")
    .addColumn("payment_id", "integer", (c) => c.references("payments.id").onDelete("set null"))
    .addColumn("resolved_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("resolved_at", "text")
    .addColumn("received_at", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .execute();
  await db.schema
    .createIndex("unapplied_payments_status")
    .on("unapplied_payments")
    .columns(["status", "invoice_id"])
    .execute();
  await db.schema
    .createIndex("unapplied_payments_invoice")
    .on("unapplied_payments")
    .column("invoice_id")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("unapplied_payments").execute();
  await db.schema.alterTable("payment_sessions").dropColumn("expires_at").execute();
  await db.schema.alterTable("payment_sessions").dropColumn("url").execute();
}
