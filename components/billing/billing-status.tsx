import type { InvoiceStatus, QuoteStatus } from "@/db/billing-schema";
import { INVOICE_STATUS_LABEL, QUOTE_STATUS_LABEL, STATUS_TONE } from "./labels";

/** A quote's state as the customer reads it where it differs: an offered quote waits on them. */
const QUOTE_STATUS_FOR_CUSTOMER: Partial<Record<QuoteStatus, string>> = {
  offered: "Waiting for your go-ahead",
};

export function BillingStatus(
  props:
    | { kind: "quote"; status: QuoteStatus; customerView?: boolean }
    | { kind: "invoice"; status: InvoiceStatus },
) {
  const label =
    props.kind === "quote"
      ? ((props.customerView ? QUOTE_STATUS_FOR_CUSTOMER[props.status] : undefined) ??
        QUOTE_STATUS_LABEL[props.status])
      : INVOICE_STATUS_LABEL[props.status];
  return (
    <span
      className={`inline-block rounded px-2 py-0.5 text-xs font-semibold ${STATUS_TONE[props.status]}`}
      data-testid={`${props.kind}-status`}
    >
      {label}
    </span>
  );
}
