import { type Expression, type SqlBool, sql } from "kysely";

/** `like` pattern characters (and the escape itself) taken literally. */
function escapeLike(term: string): string {
  return term.replace(/[!%_]/g, (c) => `!${c}`);
}

/**
 * True where any of the columns contains the term, case-insensitively and with no wildcards.
 * Both sides are lower-cased, so `like` matches the same on SQLite (case-blind for ASCII) and on
 * PostgreSQL (case-sensitive).
 */
export function containsText(
  columns: Expression<string | null>[],
  term: string,
): Expression<SqlBool> {
  const pattern = `%${escapeLike(term.toLowerCase())}%`;
  const tests = columns.map(
    (c) => sql<SqlBool>`lower(coalesce(${c}, '')) like ${pattern} escape '!'`,
  );
  return sql<SqlBool>`(${sql.join(tests, sql` or `)})`;
}
