import { type Expression, type Kysely, type RawBuilder, type SqlBool, sql } from "kysely";
import { isPostgres } from "./dialect";
import type { Database } from "./schema";

// The job and customer searches, on each engine's full-text index (migration 0190): FTS5 tables
// on SQLite, expression GIN indexes on PostgreSQL. What the counter types is cut into words at
// spaces; each word is cut again at anything that is not a letter or digit ("2026-00" is the two
// pieces 2026 and 00 side by side) and its last piece matches as a prefix, so "2026-00" finds job
// 2026-0012 and "smi" finds Smith. Every word must be found (in any of the searched columns).

/**
 * The words of a search, each as its pieces (lower case, letters and digits only); words with
 * no letter or digit are left out.
 *
 * @example searchWords("2026-00  Smi") // [["2026", "00"], ["smi"]]
 */
export function searchWords(term: string): string[][] {
  return term
    .toLowerCase()
    .split(/\s+/)
    .map((word) => word.split(/[^\p{L}\p{N}]+/u).filter(Boolean))
    .filter((pieces) => pieces.length > 0);
}

/** An FTS5 query: each word a phrase whose last piece is a prefix; all words must match. */
function ftsQuery(words: string[][]): string {
  return words.map((pieces) => `"${pieces.join(" ")}"*`).join(" AND ");
}

/** One word as tsquery text: its pieces side by side, the last one a prefix. */
function tsWord(pieces: string[]): string {
  return `(${pieces.map((p, i) => `'${p}'${i === pieces.length - 1 ? ":*" : ""}`).join(" <-> ")})`;
}

/** A PostgreSQL tsquery of the words joined by `op`: "&" (every word) or "|" (any word). */
function tsQuery(words: string[][], op: "&" | "|"): RawBuilder<unknown> {
  return sql`to_tsquery('simple'::regconfig, ${words.map(tsWord).join(` ${op} `)})`;
}

// The same expressions as the indexes of migration 0190 (PostgreSQL uses an index only for the
// expression it was built on, so these must not change on their own).
function jobWords(table: string) {
  return sql`to_tsvector('simple'::regconfig, regexp_replace(lower(coalesce(${sql.ref(`${table}.number`)}, '') || ' ' || coalesce(${sql.ref(`${table}.engine`)}, '')), '[[:punct:][:space:]]+', ' ', 'g'))`;
}
function customerNameWords(table: string) {
  return sql`to_tsvector('simple'::regconfig, regexp_replace(lower(coalesce(${sql.ref(`${table}.name`)}, '')), '[[:punct:][:space:]]+', ' ', 'g'))`;
}
function customerWords(table: string) {
  const c = (column: string) => sql`coalesce(${sql.ref(`${table}.${column}`)}, '')`;
  return sql`to_tsvector('simple'::regconfig, regexp_replace(lower(${c("name")} || ' ' || ${c("company")} || ' ' || ${c("email")} || ' ' || ${c("phone")}), '[[:punct:][:space:]]+', ' ', 'g'))`;
}

/**
 * The condition for jobs (`jobs`, joined or not) whose number, engine or customer's name holds
 * every word of the search; undefined when the search has no letter or digit (no filter).
 */
export function jobSearch(db: Kysely<Database>, term: string): Expression<SqlBool> | undefined {
  const words = searchWords(term);
  if (words.length === 0) return undefined;
  if (!isPostgres(db)) {
    return sql<SqlBool>`jobs.id in (select rowid from job_search where job_search match ${ftsQuery(words)})`;
  }
  // Jobs whose own words hold every word, and jobs of customers whose name holds every word
  // (each one GIN lookup); with several words, also jobs of customers whose name holds some of
  // them, kept when the job's and the name's words together hold every word ("smi flat": the
  // customer's name, then the engine's).
  const all = tsQuery(words, "&");
  const mixed =
    words.length > 1
      ? sql`union
    select jc.id from customers cs join jobs jc on jc.customer_id = cs.id
    where ${customerNameWords("cs")} @@ ${tsQuery(words, "|")}
      and not (${customerNameWords("cs")} @@ ${all})
      and (${jobWords("jc")} || ${customerNameWords("cs")}) @@ ${all}`
      : sql``;
  // `= any(array(...))`: the few ids found are worked out once, then fetched by primary key
  // (as `in (...)`, the planner may walk every job in id order to meet them).
  return sql<SqlBool>`jobs.id = any(array(
    select js.id from jobs js where ${jobWords("js")} @@ ${all}
    union
    select jc.id from customers cs join jobs jc on jc.customer_id = cs.id
    where ${customerNameWords("cs")} @@ ${all}
    ${mixed}
  ))`;
}

/**
 * The condition for customers (`customers`) whose name, company, e-mail or phone holds every word
 * of the search; undefined when the search has no letter or digit (no filter).
 */
export function customerSearch(
  db: Kysely<Database>,
  term: string,
): Expression<SqlBool> | undefined {
  const words = searchWords(term);
  if (words.length === 0) return undefined;
  if (!isPostgres(db)) {
    return sql<SqlBool>`customers.id in (select rowid from customer_search where customer_search match ${ftsQuery(words)})`;
  }
  return sql<SqlBool>`${customerWords("customers")} @@ ${tsQuery(words, "&")}`;
}
