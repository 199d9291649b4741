import type { Kysely } from "kysely";
import { incrementSequence } from "@/db/number-sequences";
import type { Database } from "@/db/schema";

/** Document kinds that carry a number, and the prefix printed before it. */
export const DOCUMENT_PREFIX = { invoice: "INV", quote: "Q" } as const;
export type NumberedDocument = keyof typeof DOCUMENT_PREFIX;

/** The counter a document's number is drawn from: one per kind and calendar year (UTC). */
export function sequenceName(kind: NumberedDocument, year: number): string {
  return `${kind}-${year}`;
}

/**
 * The printed number: prefix, year, and the sequence value padded to four digits (wider past
 * 9999, never truncated).
 *
 * @example formatDocumentNumber("invoice", 2026, 1) // "INV-2026-0001"
 */
export function formatDocumentNumber(kind: NumberedDocument, year: number, value: number): string {
  return `${DOCUMENT_PREFIX[kind]}-${year}-${String(value).padStart(4, "0")}`;
}

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
  return formatDocumentNumber(kind, year, await incrementSequence(db, sequenceName(kind, year)));
}
