import type { Kysely } from "kysely";

// 1 when the machinist confirmed a weight far from the rest of its kind; every other write sets 0.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("part_weights")
    .addColumn("confirmed_outlier", "integer", (c) => c.notNull().defaultTo(0))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("part_weights").dropColumn("confirmed_outlier").execute();
}
