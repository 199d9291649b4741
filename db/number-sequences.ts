import type { Kysely } from "kysely";
import type { Database } from "./schema";

/**
 * Adds one to a named counter and answers the new value (1 for a counter not used before), in a
 * single statement: an insert that, when the row is there, increments it instead. The row lock
 * the statement takes makes simultaneous callers wait their turn on PostgreSQL, so each gets its
 * own value; SQLite runs one writer at a time anyway. Values are integers, compared as integers.
 */
export async function incrementSequence(db: Kysely<Database>, name: string): Promise<number> {
  const row = await db
    .insertInto("number_sequences")
    .values({ name, last_value: 1 })
    .onConflict((oc) =>
      // Qualified: in an upsert PostgreSQL would not know which `last_value` (the stored row's or
      // the proposed one) a bare name means.
      oc.column("name").doUpdateSet((eb) => ({
        last_value: eb("number_sequences.last_value", "+", 1),
      })),
    )
    .returning("last_value")
    .executeTakeFirstOrThrow();
  return Number(row.last_value);
}
