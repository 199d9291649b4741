import type { ColumnType, Generated, Insertable, Selectable } from "kysely";

// Money, rates and quantities are decimal strings (SQLite TEXT); see lib/billing/totals.ts.

type Timestamp = ColumnType<string, string | undefined, string>;

export const PRICE_KINDS = [
  "balancing-by-layout",
  "extra-rotating-part",
  "machining-per-part",
  "rush",
  "other",
] as const;
export type PriceKind = (typeof PRICE_KINDS)[number];

/** What an entry is charged by: one each, or one per cylinder of the job (pistons, rods). */
export const PRICE_UNITS = ["each", "per-cylinder"] as const;
export type PriceUnit = (typeof PRICE_UNITS)[number];

export const QUOTE_STATUSES = ["draft", "offered", "accepted", "withdrawn"] as const;
export type QuoteStatus = (typeof QUOTE_STATUSES)[number];

export const INVOICE_STATUSES = ["draft", "issued", "paid", "void"] as const;
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];

export const PAYMENT_METHODS = ["online", "cash", "bank-transfer", "card-in-shop"] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
/** The methods the counter records by hand; "online" only ever comes from the provider. */
export const MANUAL_PAYMENT_METHODS = ["cash", "bank-transfer", "card-in-shop"] as const;

export interface ShopSettingsTable {
  id: ColumnType<1, 1, never>;
  shop_name: string;
  address: string | null;
  phone: string | null;
  email: string | null;
  tax_rate: string;
  currency: string;
  invoice_footer: string | null;
  max_upload_mb: string;
  /** Percent of the median of its kind a weight may sit from before it is held (default "5"). */
  outlier_percent: Generated<string>;
  /** The oil allowance per rod new jobs start with, in grams. */
  oil_allowance_per_rod_g: Generated<string>;
  version: Generated<number>;
  updated_at: Timestamp;
}

export interface PriceItemTable {
  id: Generated<number>;
  code: string;
  description: string;
  kind: PriceKind;
  unit_price: string;
  /** "each" or "per-cylinder" (see PRICE_UNITS). */
  unit: ColumnType<PriceUnit, PriceUnit | undefined, PriceUnit>;
  active: Generated<number>;
  version: Generated<number>;
  created_at: ColumnType<string, string | undefined, never>;
  updated_at: Timestamp;
}

export interface NumberSequenceTable {
  name: string;
  last_value: number;
}

export interface QuoteTable {
  id: Generated<number>;
  number: string;
  job_id: number;
  status: ColumnType<QuoteStatus, QuoteStatus | undefined, QuoteStatus>;
  tax_rate: string;
  currency: string;
  subtotal: string;
  tax: string;
  total: string;
  offered_at: string | null;
  accepted_at: string | null;
  accepted_by: number | null;
  withdrawn_at: string | null;
  created_by: number | null;
  version: Generated<number>;
  created_at: ColumnType<string, string | undefined, never>;
  updated_at: Timestamp;
}

/** One line of a quote or an invoice: the two tables have the same columns. */
interface DocumentLineColumns {
  id: Generated<number>;
  position: number;
  price_item_id: number | null;
  code: string | null;
  description: string;
  quantity: string;
  unit_price: string;
  line_total: string;
}

export interface QuoteLineTable extends DocumentLineColumns {
  quote_id: number;
}

export interface InvoiceTable {
  id: Generated<number>;
  number: string | null;
  job_id: number;
  quote_id: number | null;
  status: ColumnType<InvoiceStatus, InvoiceStatus | undefined, InvoiceStatus>;
  tax_rate: string;
  currency: string;
  subtotal: string;
  tax: string;
  total: string;
  amount_paid: ColumnType<string, string | undefined, string>;
  issuer_json: string | null;
  bill_to: string | null;
  footer: string | null;
  issued_at: string | null;
  paid_at: string | null;
  voided_at: string | null;
  created_by: number | null;
  version: Generated<number>;
  created_at: ColumnType<string, string | undefined, never>;
  updated_at: Timestamp;
}

export interface InvoiceLineTable extends DocumentLineColumns {
  invoice_id: number;
}

export interface PaymentSessionTable {
  id: string;
  invoice_id: number;
  amount: string;
  currency: string;
  status: ColumnType<
    "open" | "complete" | "expired",
    "open" | "complete" | "expired" | undefined,
    "open" | "complete" | "expired"
  >;
  created_by: number | null;
  created_at: ColumnType<string, string | undefined, never>;
  /** The provider's payment page, offered again while the session is open. */
  url: ColumnType<string | null, string | null | undefined, string | null>;
  /** When the provider closes the page (ISO 8601). */
  expires_at: ColumnType<string | null, string | null | undefined, string | null>;
  /** When closing the page at the provider last failed (ISO 8601); null when nothing is pending. */
  close_failed_at: ColumnType<string | null, string | null | undefined, string | null>;
  /** Why it failed, as the provider or the network said. */
  close_error: ColumnType<string | null, string | null | undefined, string | null>;
}

export type UnappliedPaymentStatus = "open" | "applied" | "refunded";

/** An online payment received and not put on an invoice, until it is applied or refunded. */
export interface UnappliedPaymentTable {
  id: Generated<number>;
  event_id: string;
  session_id: string;
  invoice_id: number | null;
  amount: string;
  currency: string;
  reason: string;
  reference: string | null;
  status: ColumnType<
    UnappliedPaymentStatus,
    UnappliedPaymentStatus | undefined,
    UnappliedPaymentStatus
  >;
  note: string | null;
  payment_id: number | null;
  resolved_by: number | null;
  resolved_at: string | null;
  received_at: string;
  version: ColumnType<number, number | undefined, number>;
}

export interface PaymentTable {
  id: Generated<number>;
  invoice_id: number;
  method: PaymentMethod;
  amount: string;
  reference: string | null;
  provider_session_id: string | null;
  provider_event_id: string | null;
  recorded_by: number | null;
  received_at: string;
  created_at: ColumnType<string, string | undefined, never>;
}

export interface PaymentEventTable {
  id: Generated<number>;
  event_id: string | null;
  type: string | null;
  outcome: string;
  invoice_id: number | null;
  detail: string | null;
  received_at: ColumnType<string, string | undefined, never>;
}

/** The billing area's tables; `Database` in db/schema.ts extends this. */
export interface BillingTables {
  shop_settings: ShopSettingsTable;
  price_items: PriceItemTable;
  number_sequences: NumberSequenceTable;
  quotes: QuoteTable;
  quote_lines: QuoteLineTable;
  invoices: InvoiceTable;
  invoice_lines: InvoiceLineTable;
  payment_sessions: PaymentSessionTable;
  payments: PaymentTable;
  payment_events: PaymentEventTable;
  unapplied_payments: UnappliedPaymentTable;
}

export type ShopSettingsRow = Selectable<ShopSettingsTable>;
export type PriceItemRow = Selectable<PriceItemTable>;
export type NewPriceItemRow = Insertable<PriceItemTable>;
export type QuoteRow = Selectable<QuoteTable>;
export type QuoteLineRow = Selectable<QuoteLineTable>;
export type InvoiceRow = Selectable<InvoiceTable>;
export type InvoiceLineRow = Selectable<InvoiceLineTable>;
export type PaymentRow = Selectable<PaymentTable>;
export type PaymentSessionRow = Selectable<PaymentSessionTable>;
export type PaymentEventRow = Selectable<PaymentEventTable>;
export type UnappliedPaymentRow = Selectable<UnappliedPaymentTable>;
