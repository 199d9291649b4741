import type { Kysely } from "kysely";
import { sql } from "kysely";
import { idColumn } from "./support/dialect";

// The customer's requests for the build, one row each: open until ticked done or explained.
// Times are written by the app (ISO-8601 text), so no engine-specific default is needed.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("build_requests")
    .addColumn("id", "integer", idColumn(db))
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("text", "text", (c) => c.notNull())
    .addColumn("state", "text", (c) =>
      c
        .notNull()
        .defaultTo("open")
        .check(sql`state in ('open','done','explained')`),
    )
    .addColumn("note", "text")
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("created_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("created_at", "text", (c) => c.notNull())
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex("build_requests_by_job")
    .on("build_requests")
    .columns(["job_id", "id"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("build_requests").execute();
}
