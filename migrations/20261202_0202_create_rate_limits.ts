import type { Kysely } from "kysely";

// Request rate limits shared by every app server: one row per key (a limit's name and what it
// counts, such as a client address), the points used in the current window and when it ends.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("rate_limits")
    .addColumn("key", "text", (c) => c.primaryKey())
    .addColumn("points", "integer", (c) => c.notNull().defaultTo(0))
    .addColumn("expires_at", "bigint")
    .execute();
  await db.schema
    .createIndex("rate_limits_expires_at")
    .on("rate_limits")
    .column("expires_at")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("rate_limits").execute();
}
