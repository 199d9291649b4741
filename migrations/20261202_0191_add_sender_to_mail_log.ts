import type { Kysely } from "kysely";

// The outbox shows each message from the mail log alone (never from files the local capture
// server writes), so the log keeps who it went out as: the From and Reply-To of the last attempt.
// Subject, recipient and both bodies were there already.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("mail_log").addColumn("from_address", "text").execute();
  await db.schema.alterTable("mail_log").addColumn("reply_to", "text").execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("mail_log").dropColumn("reply_to").execute();
  await db.schema.alterTable("mail_log").dropColumn("from_address").execute();
}
