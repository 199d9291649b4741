import type { DB } from "@/db/client";
import {
  findInvoiceById,
  findLiveInvoiceForQuote,
  type Invoice,
  listInvoices,
} from "@/db/invoices";
import type { Job } from "@/db/jobs";
import { listPaymentsForInvoice, type Payment } from "@/db/payments";
import { listPriceItems, type PriceItem } from "@/db/prices";
import type { Quote } from "@/db/quotes";
import { findCounterSettings } from "@/db/counter-settings";
import { findShopSettings } from "@/db/settings";
import type { User } from "@/db/users";
import { type Asker, isCustomer, may } from "@/lib/auth/policy";
import { findJobForUser } from "@/lib/jobs/access";
import { findInvoiceForUser, findQuoteForUser, listQuotesForUser } from "./access";
import { type InvoiceAction, invoiceActions, type QuoteAction, quoteActions } from "./actions";

export type InvoiceWithPayments = Invoice & { payments: Payment[] };

/** A quote with what the person reading it may do to it now. */
export type QuoteView = Quote & { allowedActions: QuoteAction[] };
/** An invoice with its payments and what the person reading it may do to it now. */
export type InvoiceView = InvoiceWithPayments & { allowedActions: InvoiceAction[] };

/** A quote as this person sees it, with the moves open to them (see quoteActions). */
function quoteView(quote: Quote, asker: Asker, invoiced: boolean): QuoteView {
  return { ...quote, allowedActions: quoteActions(quote, asker, { invoiced }) };
}

/** An invoice as this person sees it, with the moves open to them (see invoiceActions). */
function invoiceView(invoice: InvoiceWithPayments, asker: Asker): InvoiceView {
  return { ...invoice, allowedActions: invoiceActions(invoice, asker) };
}

export interface JobBilling {
  job: Job;
  quotes: QuoteView[];
  invoices: InvoiceView[];
  /** What this person may start on the job: a quote (when none is live), an invoice. */
  canStart: { quote: boolean; invoice: boolean };
  /** The customer's own view (their words on the buttons: "Accept this quote", "Pay online"). */
  customerView: boolean;
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
  const invoiced = (quoteId: number) =>
    full.some((i) => i.quoteId === quoteId && i.status !== "void");
  const live = quotes.some((q) => q.status !== "withdrawn");
  return {
    job,
    quotes: quotes.map((q) => quoteView(q, user, invoiced(q.id))),
    invoices: full.map((i) => invoiceView(i, user)),
    canStart: { quote: !live && may(user, "write-quotes"), invoice: may(user, "write-invoices") },
    customerView: customer,
    prices,
    taxRate: settings.taxRate,
    currency: settings.currency,
    timeZone: counter.timeZone,
  };
}

/** One quote this user may see, with the moves open to them (404 as findQuoteForUser). */
export async function loadQuoteView(db: DB, id: number, user: User): Promise<QuoteView> {
  const quote = await findQuoteForUser(db, id, user);
  return quoteView(quote, user, (await findLiveInvoiceForQuote(db, quote.id)) !== undefined);
}

/** One invoice this user may see, with its payments and the moves open to them (404 as findInvoiceForUser). */
export async function loadInvoiceView(db: DB, id: number, user: User): Promise<InvoiceView> {
  const invoice = await findInvoiceForUser(db, id, user);
  return invoiceView({ ...invoice, payments: await listPaymentsForInvoice(db, id) }, user);
}
