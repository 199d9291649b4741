import type { Kysely } from "kysely";

// What a price-list entry is charged by: "each" (one per line unless the counter types more) or
// "per-cylinder" (a piston, a rod, a cylinder's assembly: a line starts at the job's cylinder
// count). Existing entries stay "each".
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("price_items")
    .addColumn("unit", "text", (c) => c.notNull().defaultTo("each"))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("price_items").dropColumn("unit").execute();
}
