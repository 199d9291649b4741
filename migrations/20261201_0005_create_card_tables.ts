import { type Kysely, sql } from "kysely";
import { bytesType, idColumn, isPostgres, nowText } from "./support/dialect";

export async function up(db: Kysely<any>): Promise<void> {
  const ID = idColumn(db);
  const NOW = nowText(db);
  const BYTES = bytesType(db);
  // Every balance card issued: the PDF exactly as handed out, its hash and the data it was made from.
  await db.schema
    .createTable("balance_cards")
    .addColumn("id", "integer", ID)
    .addColumn("job_id", "integer", (c) => c.notNull().references("jobs.id"))
    .addColumn("revision", "integer", (c) => c.notNull().check(sql`revision >= 1`))
    .addColumn("page_size", "text", (c) => c.notNull().check(sql`page_size in ('A4','LETTER')`))
    .addColumn("pdf", BYTES, (c) => c.notNull())
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
  if (isPostgres(db)) {
    await sql`
      create function balance_cards_frozen() returns trigger language plpgsql as $$
      begin
        if new.pdf is distinct from old.pdf or new.sha256 is distinct from old.sha256
          or new.data_json is distinct from old.data_json or new.revision is distinct from old.revision
          or new.job_id is distinct from old.job_id
          or new.verification_code is distinct from old.verification_code
          or new.page_size is distinct from old.page_size
          or new.size_bytes is distinct from old.size_bytes
          or new.issued_at is distinct from old.issued_at
          or (old.superseded_at is not null and (new.superseded_at is distinct from old.superseded_at
            or new.superseded_by_revision is distinct from old.superseded_by_revision)) then
          raise exception 'an issued balance card never changes';
        end if;
        return new;
      end
      $$
    `.execute(db);
    await sql`
      create trigger balance_cards_frozen before update on balance_cards
      for each row execute function balance_cards_frozen()
    `.execute(db);
    await sql`
      create function balance_cards_kept() returns trigger language plpgsql as $$
      begin
        raise exception 'issued balance cards are kept';
      end
      $$
    `.execute(db);
    await sql`
      create trigger balance_cards_kept before delete on balance_cards
      for each row execute function balance_cards_kept()
    `.execute(db);
  } else {
    // SQLite keeps the text of a trigger as written: these two stay exactly as first applied.
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
  }

  // The shop's logo for its cards (one row), kept in the database beside them.
  await db.schema
    .createTable("shop_logo")
    .addColumn("id", "integer", (c) => c.primaryKey().check(sql`id = 1`))
    .addColumn("content", BYTES, (c) => c.notNull())
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
  if (isPostgres(db)) {
    await sql`drop function balance_cards_frozen()`.execute(db);
    await sql`drop function balance_cards_kept()`.execute(db);
  }
}
