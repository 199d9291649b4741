import type { Kysely } from "kysely";

// Lengths keep the unit and the digits they were typed with; the *_mm columns stay the engine's.
const TEXT_COLUMNS = ["bore_entered", "stroke_entered", "rod_length_entered", "drill_size"];

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("jobs")
    .addColumn("length_unit", "text", (c) => c.notNull().defaultTo("mm"))
    .execute();
  for (const column of TEXT_COLUMNS) {
    await db.schema.alterTable("jobs").addColumn(column, "text").execute();
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const column of [...TEXT_COLUMNS].reverse()) {
    await db.schema.alterTable("jobs").dropColumn(column).execute();
  }
  await db.schema.alterTable("jobs").dropColumn("length_unit").execute();
}
