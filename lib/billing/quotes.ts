import type { QuoteStatus } from "@/db/billing-schema";
import type { DB } from "@/db/client";
import { ConflictError, NotFoundError } from "@/db/errors";
import { findJobById } from "@/db/jobs";
import { takeNextNumber } from "./numbering";
import { findLiveQuoteForJob, type Quote } from "@/db/quotes";
import type { User } from "@/db/users";
import { findQuoteForUser } from "./access";
import {
  changeDocument,
  createDocument,
  type LineInput,
  priceLines,
  refuseInState,
  replaceDraftLines,
} from "./document-lines";
import { BillingInputError } from "./errors";
import { tellQuoteOffered } from "@/lib/mail/events";
import type { SendOptions } from "@/lib/mail/send";
import { may } from "@/lib/auth/policy";

/** Starts a quote for a job, priced from the list; one live (not withdrawn) quote per job. */
export async function createQuote(
  db: DB,
  input: { jobId: number; lines: readonly LineInput[] },
  actorId: number | null,
  now = new Date(),
): Promise<Quote> {
  return db.transaction().execute(async (trx) => {
    const job = await findJobById(trx, input.jobId);
    if (!job) throw new NotFoundError("job");
    const live = await findLiveQuoteForJob(trx, input.jobId);
    if (live) {
      throw new ConflictError(
        "jobId",
        live.status === "accepted"
          ? `This job's quote ${live.number} is already accepted.`
          : `This job already has quote ${live.number}: change it, or withdraw it first.`,
      );
    }
    return createDocument(
      trx,
      "quote",
      { number: await takeNextNumber(trx, "quote", now), job_id: input.jobId },
      await priceLines(trx, input.lines, [], { cylinders: job.spec.cylinders }),
      actorId,
      now,
    );
  });
}

/** Replaces a draft quote's lines (at today's prices and tax rate, kept lines at theirs). */
export async function replaceQuoteLines(
  db: DB,
  id: number,
  baseVersion: number,
  lines: readonly LineInput[],
  actorId: number | null,
  now = new Date(),
): Promise<Quote> {
  return db
    .transaction()
    .execute((trx) => replaceDraftLines(trx, "quote", id, baseVersion, lines, actorId, now));
}

type QuoteMove = "offer" | "accept" | "withdraw";

const MOVES: Record<QuoteMove, { from: readonly QuoteStatus[]; to: QuoteStatus; doing: string }> = {
  offer: { from: ["draft"], to: "offered", doing: "offered" },
  accept: { from: ["offered"], to: "accepted", doing: "accepted" },
  withdraw: { from: ["draft", "offered"], to: "withdrawn", doing: "withdrawn" },
};

/**
 * Moves a quote on: draft → offered (shown to the customer), offered → accepted, draft or
 * offered → withdrawn. `acceptFromDraft` lets the counter record an acceptance given in person
 * or by phone before the quote was offered. A quote needs at least one line to be offered or
 * accepted. Once it has left draft its lines are locked.
 */
export async function moveQuote(
  db: DB,
  id: number,
  move: QuoteMove,
  actorId: number | null,
  options: { acceptFromDraft?: boolean; now?: Date } = {},
): Promise<Quote> {
  const now = (options.now ?? new Date()).toISOString();
  return db.transaction().execute((trx) =>
    changeDocument(trx, "quote", id, {
      action: move,
      actorId,
      decide: (before) => {
        const rule = MOVES[move];
        const from =
          move === "accept" && options.acceptFromDraft
            ? [...rule.from, "draft" as const]
            : rule.from;
        if (!from.includes(before.status)) refuseInState("quote", before.status, rule.doing);
        if (move !== "withdraw" && before.lines.length === 0) {
          throw new BillingInputError("lines", "Add at least one line first.");
        }
        return {
          status: rule.to,
          offered_at: move === "offer" ? now : undefined,
          accepted_at: move === "accept" ? now : undefined,
          accepted_by: move === "accept" ? actorId : undefined,
          withdrawn_at: move === "withdraw" ? now : undefined,
          updated_at: now,
        };
      },
      logged: (before, after) => ({
        before: { status: before.status },
        after: { status: after.status },
      }),
    }),
  );
}

/**
 * Accepts a quote for the user asking. The customer whose job it is accepts an offered quote
 * from their view of the job; the counter (or owner) records an acceptance given in person,
 * also on a quote not yet offered.
 */
export async function acceptQuoteAs(db: DB, id: number, user: User): Promise<Quote> {
  await findQuoteForUser(db, id, user);
  return moveQuote(db, id, "accept", user.id, { acceptFromDraft: may(user, "write-quotes") });
}

/**
 * Offers a draft quote to the customer and tells them by e-mail, through the outbox (the owner's
 * switch for "quote-offered" respected; a message that cannot go out waits there, and the offer
 * stands either way).
 */
export async function offerQuote(
  db: DB,
  id: number,
  actorId: number | null,
  options: { now?: Date; mail?: SendOptions } = {},
): Promise<Quote> {
  const quote = await moveQuote(db, id, "offer", actorId, { now: options.now });
  await tellQuoteOffered(db, quote, actorId, options.mail); // never throws
  return quote;
}
