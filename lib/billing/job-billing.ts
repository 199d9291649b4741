import type { DB } from "@/db/client";
import { findInvoiceById, type Invoice, listInvoices } from "@/db/invoices";
import type { Job } from "@/db/jobs";
import { listPaymentsForInvoice, type Payment } from "@/db/payments";
import { listPriceItems, type PriceItem } from "@/db/prices";
import type { Quote } from "@/db/quotes";
import { findCounterSettings } from "@/db/counter-settings";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { isCustomer } from "@/lib/auth/policy";
import { findJobForUser } from "@/lib/jobs/access";
import { listQuotesForUser } from "./access";

export type InvoiceWithPayments = Invoice & { payments: Payment[] };

export interface JobBilling {
  job: Job;
  quotes: Quote[];
  invoices: InvoiceWithPayments[];
  /** Active prices for new lines; empty for customers. */
  prices: PriceItem[];
  taxRate: string;
  currency: string;
  /** The shop's IANA time zone: every date on the page is the shop's calendar date. */
  timeZone: string;
}

/** Everything the job's billing page shows, as this user may see it (404 for others' jobs). */
export async function loadJobBilling(db: DB, jobId: number, user: User): Promise<JobBilling> {
  const job = await findJobForUser(db, jobId, user);
  const customer = isCustomer(user);
  const [quotes, { invoices }, prices, settings, counter] = await Promise.all([
    listQuotesForUser(db, jobId, user),
    listInvoices(db, { jobId, excludeDrafts: customer, limit: 100 }),
    customer ? Promise.resolve([]) : listPriceItems(db, { activeOnly: true }),
    findShopSettings(db),
    findCounterSettings(db),
  ]);
  const full = await Promise.all(
    invoices.map(async (s) => ({
      ...(await findInvoiceById(db, s.id))!,
      payments: await listPaymentsForInvoice(db, s.id),
    })),
  );
  return {
    job,
    quotes,
    invoices: full,
    prices,
    taxRate: settings.taxRate,
    currency: settings.currency,
    timeZone: counter.timeZone,
  };
}
