import { type Kysely, sql } from "kysely";

// The engine build record of a job: one row per section (the engine's own figures, ring gaps,
// TDC, cam checks, valve springs, bearing clearances, deck and compression), its data as JSON
// checked by the app, each section with its own version. Times are written by the app.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("build_sections")
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("section", "text", (c) =>
      c
        .notNull()
        .check(sql`section in ('specs','rings','tdc','cam','springs','clearances','deck')`),
    )
    .addColumn("data_json", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .addPrimaryKeyConstraint("build_sections_pk", ["job_id", "section"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("build_sections").execute();
}
