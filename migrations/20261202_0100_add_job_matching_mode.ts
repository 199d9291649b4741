import type { Kysely } from "kysely";

// How a job's set is matched: "by-part" (each kind to its own target, as before) or
// "by-cylinder" (each reciprocating assembly to the lightest assembly, big ends end to end).
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("jobs")
    .addColumn("matching", "text", (c) => c.notNull().defaultTo("by-part"))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("jobs").dropColumn("matching").execute();
}
