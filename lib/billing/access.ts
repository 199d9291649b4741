import type { DB } from "@/db/client";
import { findInvoiceById, type Invoice } from "@/db/invoices";
import { listPaymentsForInvoice, type Payment } from "@/db/payments";
import { findQuoteById, listQuotesForJob, type Quote } from "@/db/quotes";
import type { User } from "@/db/users";
import { isCustomer, may } from "@/lib/auth/policy";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";

/**
 * The invoice if this user may see it. A customer sees only issued, paid or void invoices on
 * their own jobs; anything else answers the same 404 as a missing invoice.
 */
export async function findInvoiceForUser(db: DB, id: number, user: User): Promise<Invoice> {
  const invoice = await findInvoiceById(db, id);
  if (!invoice || !may(user, "read-invoice", invoice)) {
    throw new HttpError(404, "not_found", "No such invoice.");
  }
  return invoice;
}

/**
 * The quote if this user may see it. A customer sees offered and accepted quotes on their own
 * jobs; a draft, a withdrawn quote or another customer's answers the same 404 as a missing one.
 */
export async function findQuoteForUser(db: DB, id: number, user: User): Promise<Quote> {
  const quote = await findQuoteById(db, id);
  if (!quote) throw new HttpError(404, "not_found", "No such quote.");
  if (isCustomer(user)) {
    const job = await findJobForUser(db, quote.jobId, user).catch(() => undefined);
    if (!job || !may(user, "read-quote", { customerId: job.customerId, status: quote.status }))
      throw new HttpError(404, "not_found", "No such quote.");
  }
  return quote;
}

/** A job's quotes as this user may see them: customers only their own jobs', never drafts or withdrawn ones. */
export async function listQuotesForUser(db: DB, jobId: number, user: User): Promise<Quote[]> {
  await findJobForUser(db, jobId, user);
  const shop = !isCustomer(user);
  return listQuotesForJob(db, jobId, { includeDrafts: shop, includeWithdrawn: shop });
}

/** Payments on an invoice this user may see. */
export async function listPaymentsForUser(
  db: DB,
  invoiceId: number,
  user: User,
): Promise<Payment[]> {
  await findInvoiceForUser(db, invoiceId, user);
  return listPaymentsForInvoice(db, invoiceId);
}
