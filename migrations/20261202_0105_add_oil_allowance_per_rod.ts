import type { Kysely } from "kysely";

// The oil allowance per rod: on each job (null keeps an existing job on the per-crankpin figure it
// was worked out with, so no bobweight changes), and the shop's default for new jobs, in grams.
// A fresh shop starts at 2 g per rod: the low end of the 2–5 g per rod of common practice, and
// the 4 g per two-rod crankpin some shops use.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("jobs").addColumn("oil_allowance_per_rod", "text").execute();
  await db.schema
    .alterTable("shop_settings")
    .addColumn("oil_allowance_per_rod_g", "text", (c) => c.notNull().defaultTo("2"))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable("shop_settings").dropColumn("oil_allowance_per_rod_g").execute();
  await db.schema.alterTable("jobs").dropColumn("oil_allowance_per_rod").execute();
}
