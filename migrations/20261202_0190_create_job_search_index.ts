import { type Kysely, sql } from "kysely";
import { isPostgres } from "./support/dialect";

// Full-text indexes for the job and customer searches (db/search.ts reads them).
//
// SQLite: two FTS5 tables kept in step by triggers. `job_search` holds its own copy of each job's
// number, engine and customer's name (rowid = jobs.id), so a renamed customer is found under the
// new name; `customer_search` indexes the customers table itself (external content, rowid =
// customers.id). Both split text at anything that is not a letter or digit (unicode61).
//
// PostgreSQL: expression GIN indexes over the same words (punctuation turned into spaces, the
// `simple` configuration: no stemming, no stop words), so nothing needs keeping in step.

const JOB_WORDS = sql`to_tsvector('simple'::regconfig, regexp_replace(lower(coalesce(number, '') || ' ' || coalesce(engine, '')), '[[:punct:][:space:]]+', ' ', 'g'))`;
const CUSTOMER_NAME_WORDS = sql`to_tsvector('simple'::regconfig, regexp_replace(lower(coalesce(name, '')), '[[:punct:][:space:]]+', ' ', 'g'))`;
const CUSTOMER_WORDS = sql`to_tsvector('simple'::regconfig, regexp_replace(lower(coalesce(name, '') || ' ' || coalesce(company, '') || ' ' || coalesce(email, '') || ' ' || coalesce(phone, '')), '[[:punct:][:space:]]+', ' ', 'g'))`;

export async function up(db: Kysely<any>): Promise<void> {
  if (isPostgres(db)) {
    await sql`create index jobs_search on jobs using gin (${JOB_WORDS})`.execute(db);
    await sql`create index customers_name_search on customers using gin (${CUSTOMER_NAME_WORDS})`.execute(
      db,
    );
    await sql`create index customers_search on customers using gin (${CUSTOMER_WORDS})`.execute(db);
    return;
  }
  await sql`create virtual table job_search using fts5(number, engine, customer_name, tokenize = 'unicode61 remove_diacritics 2')`.execute(
    db,
  );
  await sql`
    insert into job_search (rowid, number, engine, customer_name)
    select jobs.id, jobs.number, jobs.engine, customers.name
    from jobs join customers on customers.id = jobs.customer_id
  `.execute(db);
  await sql`
    create trigger job_search_insert after insert on jobs begin
      insert into job_search (rowid, number, engine, customer_name)
      values (new.id, new.number, new.engine,
        (select name from customers where id = new.customer_id));
    end
  `.execute(db);
  await sql`
    create trigger job_search_update after update of number, engine, customer_id on jobs begin
      delete from job_search where rowid = old.id;
      insert into job_search (rowid, number, engine, customer_name)
      values (new.id, new.number, new.engine,
        (select name from customers where id = new.customer_id));
    end
  `.execute(db);
  await sql`
    create trigger job_search_delete after delete on jobs begin
      delete from job_search where rowid = old.id;
    end
  `.execute(db);
  await sql`
    create trigger job_search_customer_rename after update of name on customers begin
      update job_search set customer_name = new.name
      where rowid in (select id from jobs where customer_id = new.id);
    end
  `.execute(db);

  await sql`create virtual table customer_search using fts5(name, company, email, phone, content = 'customers', content_rowid = 'id', tokenize = 'unicode61 remove_diacritics 2')`.execute(
    db,
  );
  await sql`insert into customer_search (customer_search) values ('rebuild')`.execute(db);
  await sql`
    create trigger customer_search_insert after insert on customers begin
      insert into customer_search (rowid, name, company, email, phone)
      values (new.id, new.name, new.company, new.email, new.phone);
    end
  `.execute(db);
  await sql`
    create trigger customer_search_update after update on customers begin
      insert into customer_search (customer_search, rowid, name, company, email, phone)
      values ('delete', old.id, old.name, old.company, old.email, old.phone);
      insert into customer_search (rowid, name, company, email, phone)
      values (new.id, new.name, new.company, new.email, new.phone);
    end
  `.execute(db);
  await sql`
    create trigger customer_search_delete after delete on customers begin
      insert into customer_search (customer_search, rowid, name, company, email, phone)
      values ('delete', old.id, old.name, old.company, old.email, old.phone);
    end
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  if (isPostgres(db)) {
    await sql`drop index if exists customers_search`.execute(db);
    await sql`drop index if exists customers_name_search`.execute(db);
    await sql`drop index if exists jobs_search`.execute(db);
    return;
  }
  for (const trigger of [
    "customer_search_delete",
    "customer_search_update",
    "customer_search_insert",
    "job_search_customer_rename",
    "job_search_delete",
    "job_search_update",
    "job_search_insert",
  ]) {
    await sql`drop trigger if exists ${sql.id(trigger)}`.execute(db);
  }
  await sql`drop table if exists customer_search`.execute(db);
  await sql`drop table if exists job_search`.execute(db);
}
