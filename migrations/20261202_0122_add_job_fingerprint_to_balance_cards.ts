import type { Kysely } from "kysely";

// What the job held when the card was issued (hashes of its weights, targets, settings and
// rotating-part records, JSON), so a later change shows as "this card no longer matches".
// Null for cards issued before it existed.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("balance_cards").addColumn("job_fingerprint", "text").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("balance_cards").dropColumn("job_fingerprint").execute();
}
