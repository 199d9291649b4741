import type { Invoice } from "@/db/invoices";
import type { Quote } from "@/db/quotes";
import { type Asker, isCustomer, may } from "@/lib/auth/policy";
import { compareMoney } from "./money";

// What a person may do next to a quote or an invoice, worked out once here from the document's
// state and the person's permissions; the screen shows one button per action it is sent and no
// other, and the services refuse the same moves on their own (a stale screen gets 409).

/** The moves on a quote: its lines, offer to the customer, accept (or record acceptance), withdraw, invoice it. */
export const QUOTE_ACTIONS = ["save-lines", "offer", "accept", "withdraw", "invoice"] as const;
export type QuoteAction = (typeof QUOTE_ACTIONS)[number];

/** The moves on an invoice: its lines, issue, throw a draft away, pay online, take money at the counter, void. */
export const INVOICE_ACTIONS = [
  "save-lines",
  "issue",
  "delete",
  "pay-online",
  "record-payment",
  "void",
] as const;
export type InvoiceAction = (typeof INVOICE_ACTIONS)[number];

/**
 * What this person may do to this quote now.
 *
 * @example
 * quoteActions({ status: "offered", lines: [line] }, customer, { invoiced: false }); // ["accept"]
 * quoteActions({ status: "draft", lines: [] }, counter, { invoiced: false }); // ["save-lines", "withdraw"]
 */
export function quoteActions(
  quote: Pick<Quote, "status"> & { lines: readonly unknown[] },
  asker: Asker,
  context: { invoiced: boolean },
): QuoteAction[] {
  const desk = may(asker, "write-quotes");
  const hasLines = quote.lines.length > 0;
  const actions: QuoteAction[] = [];
  if (quote.status === "draft" && desk) {
    actions.push("save-lines");
    if (hasLines) actions.push("offer", "accept");
    actions.push("withdraw");
  } else if (quote.status === "offered") {
    if (may(asker, "accept-quote")) actions.push("accept");
    if (desk) actions.push("withdraw");
  } else if (quote.status === "accepted" && !context.invoiced && may(asker, "write-invoices")) {
    actions.push("invoice");
  }
  return actions;
}

/**
 * What this person may do to this invoice now.
 *
 * @example
 * invoiceActions({ status: "issued", amountPaid: "0.00", lines: [line] }, customer); // ["pay-online"]
 * invoiceActions({ status: "issued", amountPaid: "10.00", lines: [line] }, counter);
 * // ["pay-online", "record-payment"] (money received: no longer void-able)
 */
export function invoiceActions(
  invoice: Pick<Invoice, "status" | "amountPaid"> & { lines: readonly unknown[] },
  asker: Asker,
): InvoiceAction[] {
  const desk = may(asker, "write-invoices") && !isCustomer(asker);
  const actions: InvoiceAction[] = [];
  if (invoice.status === "draft" && desk) {
    actions.push("save-lines");
    if (invoice.lines.length > 0) actions.push("issue");
    actions.push("delete");
  } else if (invoice.status === "issued") {
    if (may(asker, "pay-invoice")) actions.push("pay-online");
    if (may(asker, "record-payment")) actions.push("record-payment");
    if (desk && compareMoney(invoice.amountPaid, "0") === 0) actions.push("void");
  }
  return actions;
}
