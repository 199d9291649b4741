import type { InvoiceRow, InvoiceStatus } from "./billing-schema";
import { type Db, type DocumentLine, listDocumentLines } from "./document-lines";
import type { ShopSettings } from "./settings";

/** The shop as printed on an issued invoice, frozen at the moment of issue. */
export type Issuer = Pick<ShopSettings, "shopName" | "address" | "phone" | "email">;

export interface Invoice {
  id: number;
  /** Null while a draft: numbers are given on issue, so the issued sequence has no gaps. */
  number: string | null;
  jobId: number;
  jobNumber: string;
  customerId: number;
  customerName: string;
  quoteId: number | null;
  status: InvoiceStatus;
  taxRate: string;
  currency: string;
  subtotal: string;
  tax: string;
  total: string;
  amountPaid: string;
  lines: DocumentLine[];
  issuer: Issuer | null;
  billTo: string | null;
  footer: string | null;
  issuedAt: string | null;
  paidAt: string | null;
  voidedAt: string | null;
  createdBy: number | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export type InvoiceSummary = Omit<Invoice, "lines" | "issuer" | "footer">;

type InvoiceJoined = InvoiceRow & {
  job_number: string;
  customer_id: number;
  customer_name: string;
};

function toSummary(row: InvoiceJoined): InvoiceSummary {
  return {
    id: row.id,
    number: row.number,
    jobId: row.job_id,
    jobNumber: row.job_number,
    customerId: row.customer_id,
    customerName: row.customer_name,
    quoteId: row.quote_id,
    status: row.status,
    taxRate: row.tax_rate,
    currency: row.currency,
    subtotal: row.subtotal,
    tax: row.tax,
    total: row.total,
    amountPaid: row.amount_paid,
    billTo: row.bill_to,
    issuedAt: row.issued_at,
    paidAt: row.paid_at,
    voidedAt: row.voided_at,
    createdBy: row.created_by,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function selectInvoices(db: Db) {
  return db
    .selectFrom("invoices")
    .innerJoin("jobs", "jobs.id", "invoices.job_id")
    .innerJoin("customers", "customers.id", "jobs.customer_id")
    .selectAll("invoices")
    .select([
      "jobs.number as job_number",
      "jobs.customer_id as customer_id",
      "customers.name as customer_name",
    ]);
}

export async function findInvoiceById(db: Db, id: number): Promise<Invoice | undefined> {
  const row = await selectInvoices(db).where("invoices.id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  return {
    ...toSummary(row),
    lines: await listDocumentLines(db, "invoice", id),
    issuer: row.issuer_json ? (JSON.parse(row.issuer_json) as Issuer) : null,
    footer: row.footer,
  };
}

export interface InvoiceQuery {
  customerId?: number;
  jobId?: number;
  status?: InvoiceStatus;
  /** Customers never see drafts. */
  excludeDrafts?: boolean;
  limit?: number;
  offset?: number;
}

/** Invoices newest first, narrowed as asked (a customer's are always narrowed to them). */
export async function listInvoices(
  db: Db,
  query: InvoiceQuery = {},
): Promise<{ invoices: InvoiceSummary[]; total: number }> {
  let base = db
    .selectFrom("invoices")
    .innerJoin("jobs", "jobs.id", "invoices.job_id")
    .innerJoin("customers", "customers.id", "jobs.customer_id");
  if (query.customerId !== undefined) base = base.where("jobs.customer_id", "=", query.customerId);
  if (query.jobId !== undefined) base = base.where("invoices.job_id", "=", query.jobId);
  if (query.status) base = base.where("invoices.status", "=", query.status);
  if (query.excludeDrafts) base = base.where("invoices.status", "!=", "draft");
  const [rows, count] = await Promise.all([
    base
      .selectAll("invoices")
      .select([
        "jobs.number as job_number",
        "jobs.customer_id as customer_id",
        "customers.name as customer_name",
      ])
      .orderBy("invoices.id", "desc")
      .limit(query.limit ?? 50)
      .offset(query.offset ?? 0)
      .execute(),
    base.select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow(),
  ]);
  return { invoices: rows.map(toSummary), total: Number(count.n) };
}

/** Whether there is an invoice with this id. */
export async function invoiceExists(db: Db, id: number): Promise<boolean> {
  const row = await db.selectFrom("invoices").select("id").where("id", "=", id).executeTakeFirst();
  return row !== undefined;
}

/** The invoice made from this quote that is not void, if there is one. */
export async function findLiveInvoiceForQuote(
  db: Db,
  quoteId: number,
): Promise<{ id: number } | undefined> {
  return db
    .selectFrom("invoices")
    .select("id")
    .where("quote_id", "=", quoteId)
    .where("status", "!=", "void")
    .executeTakeFirst();
}

/** Deletes an invoice and (by the foreign key's cascade) its lines. */
export async function deleteInvoiceRow(db: Db, id: number): Promise<void> {
  await db.deleteFrom("invoices").where("id", "=", id).execute();
}
