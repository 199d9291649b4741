import { type Kysely, sql } from "kysely";

// Job numbers (2026-0001) are drawn from number_sequences from now on, as quote and invoice
// numbers already are: one counter per year, "job-2026", holding the last number given. Start
// each year's counter at the highest number already booked that year, read as an integer
// (as text, 2026-9999 would sort after 2026-10000).
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    insert into number_sequences (name, last_value)
    select 'job-' || substr(number, 1, 4), max(cast(substr(number, 6) as integer))
    from jobs
    where number like '____-%'
    group by substr(number, 1, 4)
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`delete from number_sequences where name like 'job-%'`.execute(db);
}
