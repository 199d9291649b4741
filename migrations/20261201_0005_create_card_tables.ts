import { type Kysely, sql } from "kysely";

const NOW = sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`;

export async function up(db: Kysely<any>): Promise<void> {
  // Every balance card issued: the PDF exactly as handed out, its hash and the data it was made from.
  await db.schema
    .createTable("balance_cards")
    .addColumn("id", "integer", (c) => c.primaryKey().autoIncrement())
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id"))
    .addColumn("revision", "integer", (c) => c.notNull().check(sql`revision >= 1`))
    .addColumn("page_size", "text", (c) => c.notNull().check(sql`page_size in ('A4','LETTER')`))
    .addColumn("pdf", "blob", (c) => c.notNull())
    .addColumn("size_bytes", "integer", (c) => c.notNull().check(sql`size_bytes > 0`))
    .addColumn("sha256", "text", (c) => c.notNull().unique())
    .addColumn("data_json", "text", (c) => c.notNull())
    .addColumn("verification_code", "text", (c) => c.notNull().unique())
    .addColumn("issued_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("issued_at", "text", (c) => c.notNull().defaultTo(NOW))
    .addColumn("superseded_at", "text")
    .addColumn("superseded_by_revision", "integer")
    .addUniqueConstraint("balance_cards_one_per_revision", ["job_id", "revision"])
    .execute();

  // An issued card never changes: only the superseded mark may be set, and only once.
  await sql`
    create trigger balance_cards_frozen before update on balance_cards
    when new.pdf is not old.pdf or new.sha256 is not old.sha256 or new.data_json is not old.data_json
      or new.revision is not old.revision or new.job_id is not old.job_id
      or new.verification_code is not old.verification_code or new.page_size is not old.page_size
      or new.size_bytes is not old.size_bytes or new.issued_at is not old.issued_at
      or (old.superseded_at is not null and (new.superseded_at is not old.superseded_at
        or new.superseded_by_revision is not old.superseded_by_revision))
    begin select raise(abort, 'an issued balance card never changes'); end
  `.execute(db);
  await sql`
    create trigger balance_cards_kept before delete on balance_cards
    begin select raise(abort, 'issued balance cards are kept'); end
  `.execute(db);

  // The shop's logo for its cards (one row), kept in the database beside them.
  await db.schema
    .createTable("shop_logo")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("content", "blob", (c) => c.notNull())
    .addColumn("content_type", "text", (c) =>
      c.notNull().check(sql`content_type in ('image/png','image/jpeg')`),
    )
    .addColumn("size_bytes", "integer", (c) => c.notNull().check(sql`size_bytes > 0`))
    .addColumn("sha256", "text", (c) => c.notNull())
    .addColumn("width", "integer", (c) => c.notNull())
    .addColumn("height", "integer", (c) => c.notNull())
    .addColumn("uploaded_by", "integer", (c) => c.references("users.id").onDelete("set null"))
    .addColumn("updated_at", "text", (c) => c.notNull().defaultTo(NOW))
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("shop_logo").execute();
  await db.schema.dropTable("balance_cards").execute();
}
