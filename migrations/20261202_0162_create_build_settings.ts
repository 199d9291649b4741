import { type Kysely, sql } from "kysely";

// The shop's build settings, one row: the ring gap factor table, the smallest coil-bind margin,
// the clearance-per-inch-of-journal window, the lift for cam checks (JSON checked by the app).
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("build_settings")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("data_json", "text", (c) => c.notNull())
    .addColumn("version", "integer", (c) => c.notNull().defaultTo(1))
    .addColumn("updated_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull())
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("build_settings").execute();
}
