import type { Kysely } from "kysely";
import { incrementSequence } from "@/db/number-sequences";
import type { Database } from "@/db/schema";

/** The counter job numbers of one year are drawn from. */
export function jobSequenceName(year: number): string {
  return `job-${year}`;
}

/**
 * A job's printed number: the year, and the sequence value padded to four digits (wider past
 * 9999, never truncated).
 *
 * @example formatJobNumber(2026, 7) // "2026-0007"
 */
function formatJobNumber(year: number, value: number): string {
  return `${year}-${String(value).padStart(4, "0")}`;
}

/**
 * Draws the next job number for the year of `now` (UTC): 2026-0001, 2026-0002, … 2026-9999,
 * 2026-10000. Call it inside the transaction that stores the job, so a failed booking gives the
 * number back.
 */
export async function takeNextJobNumber(db: Kysely<Database>, now: Date): Promise<string> {
  const year = now.getUTCFullYear();
  return formatJobNumber(year, await incrementSequence(db, jobSequenceName(year)));
}
