import type { Kysely } from "kysely";

// Each user's session version: every session cookie carries the version it was issued at, and a
// cookie with an older one is refused. Disabling a user, changing their role or their password
// adds one, so every session issued before ends at once.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("users")
    .addColumn("session_version", "integer", (c) => c.notNull().defaultTo(0))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("users").dropColumn("session_version").execute();
}
