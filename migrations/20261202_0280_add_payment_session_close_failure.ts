import type { Kysely } from "kysely";

// A payment page the shop tried to close at the provider (money taken at the counter, invoice
// voided) and could not reach it: when that last failed and why, so the next checkout tries again.
// Null while nothing is pending.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("payment_sessions").addColumn("close_failed_at", "text").execute();
  await db.schema.alterTable("payment_sessions").addColumn("close_error", "text").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("payment_sessions").dropColumn("close_error").execute();
  await db.schema.alterTable("payment_sessions").dropColumn("close_failed_at").execute();
}
