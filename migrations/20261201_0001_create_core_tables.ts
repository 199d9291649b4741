import { type Kysely, sql } from "kysely";
import { idColumn, nowText } from "./support/dialect";

export async function up(db: Kysely<any>): Promise<void> {
  const ID = idColumn(db);
  const NOW = nowText(db);
  await db.schema
    .createTable("customers")
    .addColumn("id", "integer", ID)
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("company", "text")
    .addColumn("email", "text")
    .addColumn("phone", "text")
    .addColumn("address", "text")
    .addColumn("notes", "text")
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema.createIndex("customers_name").on("customers").column("name").execute();

  await db.schema
    .createTable("users")
    .addColumn("id", "integer", ID)
    .addColumn("email", "text", (c) => c.notNull().unique())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("password_hash", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) =>
      c.notNull().check(sql`role in ('owner','machinist','counter','customer')`),
    )
    .addColumn("disabled", "integer", (c) =>
      c
        .notNull()
        .defaultTo(0)
        .check(sql`disabled in (0,1)`),
    )
    .addColumn("customer_id", "integer", (c) => c.references("customers.id").onDelete("restrict"))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addCheckConstraint("customer_link", sql`(role = 'customer') = (customer_id is not null)`)
    .execute();

  await db.schema
    .createTable("jobs")
    .addColumn("id", "integer", ID)
    .addColumn("number", "text", (c) => c.notNull().unique())
    .addColumn("customer_id", "integer", (c) =>
      c.notNull().references("customers.id").onDelete("restrict"),
    )
    .addColumn("engine", "text", (c) => c.notNull())
    .addColumn("status", "text", (c) =>
      c
        .notNull()
        .defaultTo("booked")
        .check(
          sql`status in ('booked','weighing','machining','balancing','checking','ready','collected')`,
        ),
    )
    .addColumn("notes", "text")
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
  await db.schema.createIndex("jobs_customer").on("jobs").columns(["customer_id", "id"]).execute();
  await db.schema.createIndex("jobs_status").on("jobs").columns(["status", "id"]).execute();

  await db.schema
    .createTable("audit_log")
    .addColumn("id", "integer", ID)
    .addColumn("user_id", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("action", "text", (c) => c.notNull())
    .addColumn("entity", "text", (c) => c.notNull())
    .addColumn("entity_id", "text")
    .addColumn("before_json", "text")
    .addColumn("after_json", "text")
    .addColumn("at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
  await db.schema
    .createIndex("audit_entity")
    .on("audit_log")
    .columns(["entity", "entity_id"])
    .execute();

  await db.schema
    .createTable("sign_in_failures")
    .addColumn("email", "text", (c) => c.primaryKey())
    .addColumn("failures", "integer", (c) => c.notNull())
    .addColumn("last_failed_at", "text", (c) => c.notNull())
    .addColumn("locked_until", "text")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("sign_in_failures").execute();
  await db.schema.dropTable("audit_log").execute();
  await db.schema.dropTable("jobs").execute();
  await db.schema.dropTable("users").execute();
  await db.schema.dropTable("customers").execute();
}
