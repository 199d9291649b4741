import { type Kysely, sql } from "kysely";
import { formatDocumentNumber, type NumberedDocument, sequenceName } from "@/lib/billing/numbering";
import type { Database } from "./schema";

/**
 * Draws the next number for a document kind in the year of `now` (UTC): INV-2026-0001, then
 * INV-2026-0002, … Call it inside the transaction that stores the document, so a failed write
 * gives the number back.
 */
export async function takeNextNumber(
  db: Kysely<Database>,
  kind: NumberedDocument,
  now: Date,
): Promise<string> {
  const year = now.getUTCFullYear();
  const row = await db
    .insertInto("number_sequences")
    .values({ name: sequenceName(kind, year), last_value: 1 })
    .onConflict((oc) => oc.column("name").doUpdateSet({ last_value: sql`last_value + 1` }))
    .returning("last_value")
    .executeTakeFirstOrThrow();
  return formatDocumentNumber(kind, year, row.last_value);
}
