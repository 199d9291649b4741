import type { Kysely } from "kysely";
import { bytesType, idColumn } from "./support/dialect";

// The build record as issued: a PDF per revision with its hash, the snapshot it was made from
// and the verification code its QR leads to. The app never changes a row (db/build-record.ts
// has no update for it): a correction is a new revision. Times are written by the app.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("build_cards")
    .addColumn("id", "integer", idColumn(db))
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id").onDelete("cascade"))
    .addColumn("revision", "integer", (c) => c.notNull())
    .addColumn("pdf", bytesType(db), (c) => c.notNull())
    .addColumn("sha256", "text", (c) => c.notNull())
    .addColumn("data_json", "text", (c) => c.notNull())
    .addColumn("verification_code", "text", (c) => c.notNull().unique())
    .addColumn("issued_at", "text", (c) => c.notNull())
    .addColumn("issued_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addUniqueConstraint("build_cards_one_per_revision", ["job_id", "revision"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("build_cards").execute();
}
