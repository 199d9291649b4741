import type { Kysely } from "kysely";

// Sessions signed out one by one: the session's own id (a random id put on its cookie at
// sign-in) until the time that cookie would have expired anyway, when the row may go.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("ended_sessions")
    .addColumn("sid", "text", (c) => c.primaryKey())
    .addColumn("user_id", "integer", (c) => c.notNull())
    .addColumn("expires_at", "text", (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex("ended_sessions_expires_at")
    .on("ended_sessions")
    .column("expires_at")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("ended_sessions").execute();
}
