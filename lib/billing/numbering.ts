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
