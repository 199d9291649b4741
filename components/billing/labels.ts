import type { InvoiceStatus, PriceKind, PriceUnit, QuoteStatus } from "@/db/billing-schema";

export const PRICE_KIND_LABEL: Record<PriceKind, string> = {
  "balancing-by-layout": "Balancing, by engine layout",
  "extra-rotating-part": "Extra rotating part",
  "machining-per-part": "Machining, per part",
  rush: "Rush",
  other: "Other",
};

/** How an entry is charged; a per-cylinder line starts at the job's cylinder count. */
export const PRICE_UNIT_LABEL: Record<PriceUnit, string> = {
  each: "each",
  "per-cylinder": "per cylinder",
};

export const QUOTE_STATUS_LABEL: Record<QuoteStatus, string> = {
  draft: "Being written",
  offered: "Waiting for the customer",
  accepted: "Accepted",
  withdrawn: "Withdrawn",
};

export const INVOICE_STATUS_LABEL: Record<InvoiceStatus, string> = {
  draft: "Draft",
  issued: "Awaiting payment",
  paid: "Paid",
  void: "Void",
};

export const STATUS_TONE: Record<QuoteStatus | InvoiceStatus, string> = {
  draft: "bg-graphite-100 text-graphite-700",
  offered: "bg-brass-100 text-brass-700",
  accepted: "bg-emerald-100 text-emerald-800",
  withdrawn: "bg-graphite-200 text-graphite-600",
  issued: "bg-brass-100 text-brass-700",
  paid: "bg-emerald-100 text-emerald-800",
  void: "bg-graphite-200 text-graphite-600",
};

/** One set of payment-method words, shared with the invoice PDF. */
export { PAYMENT_METHOD_LABEL } from "@/lib/billing/format";
