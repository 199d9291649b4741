import type { Kysely } from "kysely";
import { BillingInputError } from "@/lib/billing/errors";
import { compareMoney } from "@/lib/billing/money";
import { createAuditEntry } from "./audit";
import type { InvoiceLineRow, InvoiceRow, InvoiceStatus } from "./billing-schema";
import { lockRow } from "./dialect";
import { ConflictError, NotFoundError, StaleWriteError } from "./errors";
import { takeNextNumber } from "./number-sequences";
import { type LineInput, priceLines, type PricedLineValues } from "./prices";
import { type DocumentLine, lineRowsAndTotals, toDocumentLine } from "./quotes";
import type { Database } from "./schema";
import { findShopSettings, type ShopSettings } from "./settings";

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

function selectInvoices(db: Kysely<Database>) {
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

async function loadInvoice(db: Kysely<Database>, id: number): Promise<Invoice | undefined> {
  const row = await selectInvoices(db).where("invoices.id", "=", id).executeTakeFirst();
  if (!row) return undefined;
  const lines: InvoiceLineRow[] = await db
    .selectFrom("invoice_lines")
    .selectAll()
    .where("invoice_id", "=", id)
    .orderBy("position")
    .execute();
  return {
    ...toSummary(row),
    lines: lines.map(toDocumentLine),
    issuer: row.issuer_json ? (JSON.parse(row.issuer_json) as Issuer) : null,
    footer: row.footer,
  };
}

export async function findInvoiceById(
  db: Kysely<Database>,
  id: number,
): Promise<Invoice | undefined> {
  return loadInvoice(db, id);
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
  db: Kysely<Database>,
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

export type NewInvoiceInput =
  | { jobId: number; quoteId: number; lines?: undefined }
  | { jobId: number; quoteId?: undefined; lines: readonly LineInput[] };

/**
 * A draft invoice for a job: a copy of its accepted quote's lines at the quoted prices, or lines
 * priced from the list. One live (not void) invoice per quote.
 */
export async function createInvoice(
  db: Kysely<Database>,
  input: NewInvoiceInput,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute(async (trx) => {
    const job = await trx
      .selectFrom("jobs")
      .select("id")
      .where("id", "=", input.jobId)
      .executeTakeFirst();
    if (!job) throw new NotFoundError("job");
    let lines: PricedLineValues[];
    if (input.quoteId !== undefined) {
      const quote = await trx
        .selectFrom("quotes")
        .select(["id", "job_id", "status", "number"])
        .where("id", "=", input.quoteId)
        .executeTakeFirst();
      if (!quote || quote.job_id !== input.jobId) {
        throw new BillingInputError("quoteId", "That quote is not for this job.");
      }
      if (quote.status !== "accepted") {
        throw new ConflictError("quoteId", `Quote ${quote.number} has not been accepted.`);
      }
      const existing = await trx
        .selectFrom("invoices")
        .select("id")
        .where("quote_id", "=", quote.id)
        .where("status", "!=", "void")
        .executeTakeFirst();
      if (existing)
        throw new ConflictError("quoteId", `Quote ${quote.number} is already invoiced.`);
      lines = (
        await trx
          .selectFrom("quote_lines")
          .selectAll()
          .where("quote_id", "=", quote.id)
          .orderBy("position")
          .execute()
      ).map((l) => ({
        priceItemId: l.price_item_id,
        code: l.code,
        description: l.description,
        quantity: l.quantity,
        unitPrice: l.unit_price,
      }));
    } else {
      lines = await priceLines(trx, input.lines);
    }
    const settings = await findShopSettings(trx);
    const { rows, totals } = lineRowsAndTotals(lines, settings.taxRate);
    const inserted = await trx
      .insertInto("invoices")
      .values({
        job_id: input.jobId,
        quote_id: input.quoteId ?? null,
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
        .insertInto("invoice_lines")
        .values(rows.map((r) => ({ ...r, invoice_id: inserted.id })))
        .execute();
    }
    const after = (await loadInvoice(trx, inserted.id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "invoice",
      entityId: after.id,
      after,
    });
    return after;
  });
}

async function lockInvoice(trx: Kysely<Database>, id: number, baseVersion?: number) {
  await lockRow(trx, "invoices", id);
  const invoice = await loadInvoice(trx, id);
  if (!invoice) throw new NotFoundError("invoice");
  if (baseVersion !== undefined && invoice.version !== baseVersion) {
    throw new StaleWriteError("invoice", invoice.version);
  }
  return invoice;
}

function refuse(status: InvoiceStatus, doing: string): never {
  throw new ConflictError("status", `An invoice that is ${status} cannot be ${doing}.`);
}

/** Replaces a draft invoice's lines; kept lines (by lineId) keep their price. */
export async function replaceInvoiceLines(
  db: Kysely<Database>,
  id: number,
  baseVersion: number,
  lines: readonly LineInput[],
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute(async (trx) => {
    const before = await lockInvoice(trx, id, baseVersion);
    if (before.status !== "draft") refuse(before.status, "changed");
    const settings = await findShopSettings(trx);
    const priced = await priceLines(trx, lines, before.lines);
    const { rows, totals } = lineRowsAndTotals(priced, settings.taxRate);
    await trx.deleteFrom("invoice_lines").where("invoice_id", "=", id).execute();
    if (rows.length > 0) {
      await trx
        .insertInto("invoice_lines")
        .values(rows.map((r) => ({ ...r, invoice_id: id })))
        .execute();
    }
    await trx
      .updateTable("invoices")
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
    const after = (await loadInvoice(trx, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "invoice",
      entityId: id,
      before,
      after,
    });
    return after;
  });
}

function billToText(c: {
  name: string;
  company: string | null;
  address: string | null;
  email: string | null;
}): string {
  return [c.name, c.company, c.address, c.email].filter((x): x is string => !!x).join("\n");
}

/**
 * Issues a draft: draws the next invoice number, applies the shop's tax rate and currency as
 * they are at this moment, and freezes the shop's and the customer's details on the invoice.
 */
export async function issueInvoice(
  db: Kysely<Database>,
  id: number,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute(async (trx) => {
    const before = await lockInvoice(trx, id);
    if (before.status !== "draft") refuse(before.status, "issued");
    if (before.lines.length === 0)
      throw new BillingInputError("lines", "Add at least one line first.");
    const settings = await findShopSettings(trx);
    const { totals } = lineRowsAndTotals(before.lines, settings.taxRate);
    if (compareMoney(totals.total, "0") <= 0) {
      throw new BillingInputError("lines", "An invoice must be for more than nothing.");
    }
    const customer = await trx
      .selectFrom("customers")
      .select(["name", "company", "address", "email"])
      .where("id", "=", before.customerId)
      .executeTakeFirstOrThrow();
    const issuer: Issuer = {
      shopName: settings.shopName,
      address: settings.address,
      phone: settings.phone,
      email: settings.email,
    };
    await trx
      .updateTable("invoices")
      .set({
        number: await takeNextNumber(trx, "invoice", now),
        status: "issued",
        tax_rate: settings.taxRate,
        currency: settings.currency,
        subtotal: totals.subtotal,
        tax: totals.tax,
        total: totals.total,
        issuer_json: JSON.stringify(issuer),
        bill_to: billToText(customer),
        footer: settings.invoiceFooter,
        issued_at: now.toISOString(),
        version: before.version + 1,
        updated_at: now.toISOString(),
      })
      .where("id", "=", id)
      .execute();
    const after = (await loadInvoice(trx, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "issue",
      entity: "invoice",
      entityId: id,
      before: { status: before.status },
      after: { status: after.status, number: after.number, total: after.total },
    });
    return after;
  });
}

/** Voids an issued invoice nothing has been paid on; it keeps its number. */
export async function voidInvoice(
  db: Kysely<Database>,
  id: number,
  actorId: number | null,
  now = new Date(),
): Promise<Invoice> {
  return db.transaction().execute(async (trx) => {
    const before = await lockInvoice(trx, id);
    if (before.status !== "issued") refuse(before.status, "voided");
    if (compareMoney(before.amountPaid, "0") !== 0) {
      throw new ConflictError(
        "status",
        "Money has been received on this invoice: it cannot be voided.",
      );
    }
    await trx
      .updateTable("invoices")
      .set({
        status: "void",
        voided_at: now.toISOString(),
        version: before.version + 1,
        updated_at: now.toISOString(),
      })
      .where("id", "=", id)
      .execute();
    const after = (await loadInvoice(trx, id))!;
    await createAuditEntry(trx, {
      userId: actorId,
      action: "void",
      entity: "invoice",
      entityId: id,
      before: { status: before.status },
      after: { status: after.status },
    });
    return after;
  });
}

/** Throws away a draft (it never had a number). */
export async function deleteDraftInvoice(
  db: Kysely<Database>,
  id: number,
  actorId: number | null,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const before = await lockInvoice(trx, id);
    if (before.status !== "draft") refuse(before.status, "deleted");
    await trx.deleteFrom("invoices").where("id", "=", id).execute();
    await createAuditEntry(trx, {
      userId: actorId,
      action: "delete",
      entity: "invoice",
      entityId: id,
      before,
    });
  });
}
