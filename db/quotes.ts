import type { Kysely } from "kysely";
import { BillingInputError } from "@/lib/billing/errors";
import { computeTotals } from "@/lib/billing/totals";
import { createAuditEntry } from "./audit";
import type { QuoteLineRow, QuoteRow, QuoteStatus } from "./billing-schema";
import { lockRow } from "./dialect";
import { ConflictError, NotFoundError, StaleWriteError } from "./errors";
import { takeNextNumber } from "./number-sequences";
import { type LineInput, priceLines, type PricedLineValues } from "./prices";
import type { Database } from "./schema";
import { findShopSettings } from "./settings";

/** One line of a quote or an invoice. Decimal strings throughout. */
export interface DocumentLine {
  id: number;
  position: number;
  priceItemId: number | null;
  code: string | null;
  description: string;
  quantity: string;
  unitPrice: string;
  lineTotal: string;
}

export interface Quote {
  id: number;
  number: string;
  jobId: number;
  status: QuoteStatus;
  taxRate: string;
  currency: string;
  subtotal: string;
  tax: string;
  total: string;
  lines: DocumentLine[];
  offeredAt: string | null;
  acceptedAt: string | null;
  acceptedBy: number | null;
  withdrawnAt: string | null;
  createdBy: number | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export function toDocumentLine(row: Omit<QuoteLineRow, "quote_id">): DocumentLine {
  return {
    id: row.id,
    position: row.position,
    priceItemId: row.price_item_id,
    code: row.code,
    description: row.description,
    quantity: row.quantity,
    unitPrice: row.unit_price,
    lineTotal: row.line_total,
  };
}

function toQuote(row: QuoteRow, lines: QuoteLineRow[]): Quote {
  return {
    id: row.id,
    number: row.number,
    jobId: row.job_id,
    status: row.status,
    taxRate: row.tax_rate,
    currency: row.currency,
    subtotal: row.subtotal,
    tax: row.tax,
    total: row.total,
    lines: lines.map(toDocumentLine),
    offeredAt: row.offered_at,
    acceptedAt: row.accepted_at,
    acceptedBy: row.accepted_by,
    withdrawnAt: row.withdrawn_at,
    createdBy: row.created_by,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/** Line columns and document totals for priced lines at a tax rate. */
export function lineRowsAndTotals(lines: readonly PricedLineValues[], taxRate: string) {
  const totals = computeTotals(lines, taxRate);
  const rows = lines.map((l, i) => ({
    position: i + 1,
    price_item_id: l.priceItemId,
    code: l.code,
    description: l.description,
    quantity: l.quantity,
    unit_price: l.unitPrice,
    line_total: totals.lineTotals[i]!,
  }));
  return { rows, totals };
}

async function loadQuote(db: Kysely<Database>, id: number): Promise<Quote | undefined> {
  const row = await db.selectFrom("quotes").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  const lines = await db
    .selectFrom("quote_lines")
    .selectAll()
    .where("quote_id", "=", id)
    .orderBy("position")
    .execute();
  return toQuote(row, lines);
}

export async function findQuoteById(db: Kysely<Database>, id: number): Promise<Quote | undefined> {
  return loadQuote(db, id);
}

/** A job's quotes, newest first; drafts left out unless asked for (customers never see them). */
export async function listQuotesForJob(
  db: Kysely<Database>,
  jobId: number,
  query: { includeDrafts?: boolean } = {},
): Promise<Quote[]> {
  let q = db.selectFrom("quotes").select("id").where("job_id", "=", jobId);
  if (!query.includeDrafts) q = q.where("status", "!=", "draft");
  const ids = await q.orderBy("id", "desc").execute();
  const quotes = await Promise.all(ids.map((r) => loadQuote(db, r.id)));
  return quotes.filter((x): x is Quote => x !== undefined);
}

/** Starts a quote for a job, priced from the list; one live (not withdrawn) quote per job. */
export async function createQuote(
  db: Kysely<Database>,
  input: { jobId: number; lines: readonly LineInput[] },
  actorId: number | null,
  now = new Date(),
): Promise<Quote> {
  return db.transaction().execute(async (trx) => {
    const job = await trx
      .selectFrom("jobs")
      .select("id")
      .where("id", "=", input.jobId)
      .executeTakeFirst();
    if (!job) throw new NotFoundError("job");
    const live = await trx
      .selectFrom("quotes")
      .select(["number", "status"])
      .where("job_id", "=", input.jobId)
      .where("status", "!=", "withdrawn")
      .executeTakeFirst();
    if (live) {
      throw new ConflictError(
        "jobId",
        live.status === "accepted"
          ? `This job's quote ${live.number} is already accepted.`
          : `This job already has quote ${live.number}: change it, or withdraw it first.`,
      );
    }
    const settings = await findShopSettings(trx);
    const { rows, totals } = lineRowsAndTotals(
      await priceLines(trx, input.lines),
      settings.taxRate,
    );
    const quote = await trx
      .insertInto("quotes")
      .values({
        number: await takeNextNumber(trx, "quote", now),
        job_id: input.jobId,
        tax_rate: settings.taxRate,
        currency: settings.currency,
        subtotal: totals.subtotal,
        tax: totals.tax,
        total: totals.total,
        created_by: actorId,
        created_at: now.toISOString(),
        updated_at: now.toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    if (rows.length > 0) {
      await trx
        .insertInto("quote_lines")
        .values(rows.map((r) => ({ ...r, quote_id: quote.id })))
        .execute();
    }
    const after = (await loadQuote(trx, quote.id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "quote",
      entityId: after.id,
      after,
    });
    return after;
  });
}

async function lockQuote(trx: Kysely<Database>, id: number, baseVersion?: number): Promise<Quote> {
  await lockRow(trx, "quotes", id);
  const quote = await loadQuote(trx, id);
  if (!quote) throw new NotFoundError("quote");
  if (baseVersion !== undefined && quote.version !== baseVersion) {
    throw new StaleWriteError("quote", quote.version);
  }
  return quote;
}

function refuse(status: QuoteStatus, doing: string): never {
  throw new ConflictError("status", `A quote that is ${status} cannot be ${doing}.`);
}

/** Replaces a draft quote's lines (at today's prices and tax rate, kept lines at theirs). */
export async function replaceQuoteLines(
  db: Kysely<Database>,
  id: number,
  baseVersion: number,
  lines: readonly LineInput[],
  actorId: number | null,
  now = new Date(),
): Promise<Quote> {
  return db.transaction().execute(async (trx) => {
    const before = await lockQuote(trx, id, baseVersion);
    if (before.status !== "draft") refuse(before.status, "changed");
    const settings = await findShopSettings(trx);
    const priced = await priceLines(trx, lines, before.lines);
    const { rows, totals } = lineRowsAndTotals(priced, settings.taxRate);
    await trx.deleteFrom("quote_lines").where("quote_id", "=", id).execute();
    if (rows.length > 0) {
      await trx
        .insertInto("quote_lines")
        .values(rows.map((r) => ({ ...r, quote_id: id })))
        .execute();
    }
    await trx
      .updateTable("quotes")
      .set({
        tax_rate: settings.taxRate,
        currency: settings.currency,
        subtotal: totals.subtotal,
        tax: totals.tax,
        total: totals.total,
        version: before.version + 1,
        updated_at: now.toISOString(),
      })
      .where("id", "=", id)
      .execute();
    const after = (await loadQuote(trx, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "quote",
      entityId: id,
      before,
      after,
    });
    return after;
  });
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
 * accepted.
 */
export async function moveQuote(
  db: Kysely<Database>,
  id: number,
  move: QuoteMove,
  actorId: number | null,
  options: { acceptFromDraft?: boolean; now?: Date } = {},
): Promise<Quote> {
  const now = (options.now ?? new Date()).toISOString();
  return db.transaction().execute(async (trx) => {
    const before = await lockQuote(trx, id);
    const rule = MOVES[move];
    const from =
      move === "accept" && options.acceptFromDraft ? [...rule.from, "draft" as const] : rule.from;
    if (!from.includes(before.status)) refuse(before.status, rule.doing);
    if (move !== "withdraw" && before.lines.length === 0) {
      throw new BillingInputError("lines", "Add at least one line first.");
    }
    await trx
      .updateTable("quotes")
      .set({
        status: rule.to,
        offered_at: move === "offer" ? now : undefined,
        accepted_at: move === "accept" ? now : undefined,
        accepted_by: move === "accept" ? actorId : undefined,
        withdrawn_at: move === "withdraw" ? now : undefined,
        version: before.version + 1,
        updated_at: now,
      })
      .where("id", "=", id)
      .execute();
    const after = (await loadQuote(trx, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: move,
      entity: "quote",
      entityId: id,
      before: { status: before.status },
      after: { status: after.status },
    });
    return after;
  });
}
