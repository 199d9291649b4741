// Why an online payment was kept to reconcile instead of being put on an invoice. Plain data, so
// the screens (client components) and the services use the same words.

export const UNAPPLIED_REASONS = [
  "invoice-settled",
  "invoice-void",
  "over-owed",
  "currency-mismatch",
  "amount-differs",
  "session-closed",
  "unknown-session",
  "invoice-mismatch",
] as const;

export type UnappliedReason = (typeof UNAPPLIED_REASONS)[number];

export const UNAPPLIED_REASON_TEXT: Record<UnappliedReason, string> = {
  "invoice-settled": "The invoice was already paid when this payment arrived: it was paid twice.",
  "invoice-void": "The invoice had been voided.",
  "over-owed": "It was more than was still owed when it arrived.",
  "currency-mismatch": "It was paid in another currency than the invoice's.",
  "amount-differs": "Its amount differs from what its payment page asked for.",
  "session-closed": "It came from a payment page that had been closed.",
  "unknown-session": "No payment page we opened matches it, so it belongs to no invoice.",
  "invoice-mismatch": "It names another invoice than the one its payment page was opened for.",
};

/** The words for a stored reason (an unknown one is shown as it is). */
export function unappliedReasonText(reason: string): string {
  return (UNAPPLIED_REASON_TEXT as Record<string, string>)[reason] ?? reason;
}
