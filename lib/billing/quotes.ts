import type { DB } from "@/db/client";
import { moveQuote, type Quote } from "@/db/quotes";
import type { User } from "@/db/users";
import { findQuoteForUser } from "./access";

/**
 * Accepts a quote for the user asking. The customer whose job it is accepts an offered quote
 * from their view of the job; the counter (or owner) records an acceptance given in person,
 * also on a quote not yet offered.
 */
export async function acceptQuoteAs(db: DB, id: number, user: User): Promise<Quote> {
  await findQuoteForUser(db, id, user);
  return moveQuote(db, id, "accept", user.id, { acceptFromDraft: user.role !== "customer" });
}
