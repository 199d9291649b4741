import { type Kysely, sql } from "kysely";

// The counter's settings, one row: how the shop's e-mails to customers go out (the sender's name,
// the address replies go to, the signature, the messages the owner switched off, as a comma list
// of kinds) and the shop's time zone (an IANA name such as "America/Denver") for every date shown
// and for "today" and "overdue" on the board. No row: the shop's name and e-mail, every message
// on, UTC.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("counter_settings")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("sender_name", "text")
    .addColumn("reply_to", "text")
    .addColumn("signature", "text")
    .addColumn("mail_off", "text", (c) => c.notNull().defaultTo(""))
    .addColumn("time_zone", "text", (c) => c.notNull().defaultTo("UTC"))
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("counter_settings").execute();
}
