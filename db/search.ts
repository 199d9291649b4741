import { type Expression, type SqlBool, sql } from "kysely";

/** True where any of the columns contains the term, case-insensitively and with no wildcards. */
export function containsText(
  columns: Expression<string | null>[],
  term: string,
): Expression<SqlBool> {
  const needle = term.toLowerCase();
  const tests = columns.map((c) => sql<SqlBool>`instr(lower(coalesce(${c}, '')), ${needle}) > 0`);
  return sql<SqlBool>`(${sql.join(tests, sql` or `)})`;
}
