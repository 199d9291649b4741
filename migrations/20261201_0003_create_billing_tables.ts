import { type Kysely, sql } from "kysely";
import { idColumn, nowText } from "./support/dialect";

// Shop settings, the price list, quotes, invoices, payments and the payment provider's
// notifications. Money and quantities are decimal strings (TEXT), never floats.
export async function up(db: Kysely<any>): Promise<void> {
  const ID = idColumn(db);
  const NOW = nowText(db);
  await db.schema
    .createTable("shop_settings")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("shop_name", "text", (c) => c.notNull())
    .addColumn("address", "text")
    .addColumn("phone", "text")
    .addColumn("email", "text")
    .addColumn("tax_rate", "text", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("invoice_footer", "text")
    .addColumn("max_upload_mb", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();

  await db.schema
    .createTable("price_items")
    .addColumn("id", "integer", ID)
    .addColumn("code", "text", (c) => c.notNull().unique())
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("kind", "text", (c) =>
      c
        .notNull()
        .check(
          sql`kind in ('balancing-by-layout','extra-rotating-part','machining-per-part','rush','other')`,
        ),
    )
    .addColumn("unit_price", "text", (c) => c.notNull())
    .addColumn("active", "integer", (c) =>
      c
        .notNull()
        .defaultTo(1)
        .check(sql`active in (0,1)`),
    )
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();

  // One counter per document kind and year ("invoice-2026"): numbers never repeat or skip.
  await db.schema
    .createTable("number_sequences")
    .addColumn("name", "text", (c) => c.primaryKey())
    .addColumn("last_value", "integer", (c) => c.notNull())
    .execute();

  await db.schema
    .createTable("quotes")
    .addColumn("id", "integer", ID)
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("restrict"))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("draft")
        .check(sql`status in ('draft','offered','accepted','withdrawn')`),
    )
    .addColumn("tax_rate", "text", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("subtotal", "text", (c) => c.notNull())
    .addColumn("tax", "text", (c) => c.notNull())
    .addColumn("total", "text", (c) => c.notNull())
    .addColumn("offered_at", "text")
    .addColumn("accepted_at", "text")
    .addColumn("accepted_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("withdrawn_at", "text")
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema.createIndex("quotes_job").on("quotes").columns(["job_id", "id"]).execute();

  await db.schema
    .createTable("quote_lines")
    .addColumn("id", "integer", ID)
    .addColumn("quote_id", "integer", (c) =>
      c.notNull().references("quotes.id").onDelete("cascade"),
    )
    .addColumn("position", "integer", (c) => c.notNull())
    .addColumn("price_item_id", "integer", (c) =>
      c.references("price_items.id").onDelete("set null"),
    )
    .addColumn("code", "text")
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("quantity", "text", (c) => c.notNull())
    .addColumn("unit_price", "text", (c) => c.notNull())
    .addColumn("line_total", "text", (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex("quote_lines_quote")
    .on("quote_lines")
    .columns(["quote_id", "position"])
    .execute();

  await db.schema
    .createTable("invoices")
    .addColumn("id", "integer", ID)
    // Given when the invoice is issued, so the issued sequence has no gaps.
    .addColumn("number", "text", (c) => c.unique())
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("restrict"))
    .addColumn("quote_id", "integer", (c) => c.references("quotes.id").onDelete("set null"))
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("draft")
        .check(sql`status in ('draft','issued','paid','void')`),
    )
    .addColumn("tax_rate", "text", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("subtotal", "text", (c) => c.notNull())
    .addColumn("tax", "text", (c) => c.notNull())
    .addColumn("total", "text", (c) => c.notNull())
    .addColumn("amount_paid", "text", (c) => c.notNull().defaultTo("0.00"))
    .addColumn("issuer_json", "text")
    .addColumn("bill_to", "text")
    .addColumn("footer", "text")
    .addColumn("issued_at", "text")
    .addColumn("paid_at", "text")
    .addColumn("voided_at", "text")
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addCheckConstraint("invoice_number_when_issued", sql`(status = 'draft') = (number is null)`)
    .execute();
  await db.schema.createIndex("invoices_job").on("invoices").columns(["job_id", "id"]).execute();
  await db.schema.createIndex("invoices_status").on("invoices").columns(["status", "id"]).execute();

  await db.schema
    .createTable("invoice_lines")
    .addColumn("id", "integer", ID)
    .addColumn("invoice_id", "integer", (c) =>
      c.notNull().references("invoices.id").onDelete("cascade"),
    )
    .addColumn("position", "integer", (c) => c.notNull())
    .addColumn("price_item_id", "integer", (c) =>
      c.references("price_items.id").onDelete("set null"),
    )
    .addColumn("code", "text")
    .addColumn("description", "text", (c) => c.notNull())
    .addColumn("quantity", "text", (c) => c.notNull())
    .addColumn("unit_price", "text", (c) => c.notNull())
    .addColumn("line_total", "text", (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex("invoice_lines_invoice")
    .on("invoice_lines")
    .columns(["invoice_id", "position"])
    .execute();

  // Checkout sessions opened with the payment provider, so a notification can be matched.
  await db.schema
    .createTable("payment_sessions")
    .addColumn("id", "text", (c) => c.primaryKey())
    .addColumn("invoice_id", "integer", (c) =>
      c.notNull().references("invoices.id").onDelete("restrict"),
    )
    .addColumn("amount", "text", (c) => c.notNull())
    .addColumn("currency", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("open")
        .check(sql`status in ('open','complete','expired')`),
    )
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema
    .createIndex("payment_sessions_invoice")
    .on("payment_sessions")
    .column("invoice_id")
    .execute();

  await db.schema
    .createTable("payments")
    .addColumn("id", "integer", ID)
    .addColumn("invoice_id", "integer", (c) =>
      c.notNull().references("invoices.id").onDelete("restrict"),
    )
    .addColumn("method", "text", (c) =>
      c.notNull().check(sql`method in ('online','cash','bank-transfer','card-in-shop')`),
    )
    .addColumn("amount", "text", (c) => c.notNull())
    .addColumn("reference", "text")
    .addColumn("provider_session_id", "text", (c) => c.unique())
    .addColumn("provider_event_id", "text", (c) => c.unique())
    .addColumn("recorded_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("received_at", "text", (c) => c.notNull())
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema.createIndex("payments_invoice").on("payments").column("invoice_id").execute();

  // Every notification that reached the webhook, signed or not, and what came of it.
  await db.schema
    .createTable("payment_events")
    .addColumn("id", "integer", ID)
    .addColumn("event_id", "text", (c) => c.unique())
    .addColumn("type", "text")
    .addColumn("outcome", "text", (c) => c.notNull())
    .addColumn("invoice_id", "integer", (c) => c.references("invoices.id").onDelete("set null"))
    .addColumn("detail", "text")
    .addColumn("received_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("payment_events").execute();
  await db.schema.dropTable("payments").execute();
  await db.schema.dropTable("payment_sessions").execute();
  await db.schema.dropTable("invoice_lines").execute();
  await db.schema.dropTable("invoices").execute();
  await db.schema.dropTable("quote_lines").execute();
  await db.schema.dropTable("quotes").execute();
  await db.schema.dropTable("number_sequences").execute();
  await db.schema.dropTable("price_items").execute();
  await db.schema.dropTable("shop_settings").execute();
}
