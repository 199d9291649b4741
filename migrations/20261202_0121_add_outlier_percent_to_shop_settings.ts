import type { Kysely } from "kysely";

// How far (percent of the median of its kind) a weight may sit before it is held for confirmation.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .alterTable("shop_settings")
    .addColumn("outlier_percent", "text", (c) => c.notNull().defaultTo("5"))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("shop_settings").dropColumn("outlier_percent").execute();
}
