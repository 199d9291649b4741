import type { QuoteRow, QuoteStatus } from "./billing-schema";
import { type Db, type DocumentLine, listDocumentLines } from "./document-lines";

export type { DocumentLine } from "./document-lines";

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

function toQuote(row: QuoteRow, lines: DocumentLine[]): Quote {
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
    lines,
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

export async function findQuoteById(db: Db, id: number): Promise<Quote | undefined> {
  const row = await db.selectFrom("quotes").selectAll().where("id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  return toQuote(row, await listDocumentLines(db, "quote", id));
}

/**
 * A job's quotes, newest first; drafts and withdrawn quotes left out unless asked for (customers
 * see neither).
 */
export async function listQuotesForJob(
  db: Db,
  jobId: number,
  query: { includeDrafts?: boolean; includeWithdrawn?: boolean } = {},
): Promise<Quote[]> {
  let q = db.selectFrom("quotes").select("id").where("job_id", "=", jobId);
  if (!query.includeDrafts) q = q.where("status", "!=", "draft");
  if (!query.includeWithdrawn) q = q.where("status", "!=", "withdrawn");
  const ids = await q.orderBy("id", "desc").execute();
  const quotes = await Promise.all(ids.map((r) => findQuoteById(db, r.id)));
  return quotes.filter((x): x is Quote => x !== undefined);
}

/** The job's quote that is not withdrawn, if it has one. */
export async function findLiveQuoteForJob(
  db: Db,
  jobId: number,
): Promise<Pick<Quote, "id" | "number" | "status"> | undefined> {
  return db
    .selectFrom("quotes")
    .select(["id", "number", "status"])
    .where("job_id", "=", jobId)
    .where("status", "!=", "withdrawn")
    .executeTakeFirst();
}
