import type { InvoiceStatus, QuoteStatus } from "@/db/billing-schema";
import { INVOICE_STATUS_LABEL, QUOTE_STATUS_LABEL, STATUS_TONE } from "./labels";

export function BillingStatus(
  props: { kind: "quote"; status: QuoteStatus } | { kind: "invoice"; status: InvoiceStatus },
) {
  const label =
    props.kind === "quote" ? QUOTE_STATUS_LABEL[props.status] : INVOICE_STATUS_LABEL[props.status];
  return (
    <span
      className={`inline-block rounded px-2 py-0.5 text-xs font-semibold ${STATUS_TONE[props.status]}`}
      data-testid={`${props.kind}-status`}
    >
      {label}
    </span>
  );
}
