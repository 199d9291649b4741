import Link from "next/link";
import { notFound } from "next/navigation";
import { BillingStatus } from "@/components/billing/billing-status";
import { RefreshWhileWaiting } from "@/components/billing/refresh-while-waiting";
import { getDb } from "@/db/client";
import { requirePagePermission } from "@/lib/auth/guard";
import { findInvoiceForUser } from "@/lib/billing/access";
import { formatMoney } from "@/lib/billing/format";
import { subtractMoney } from "@/lib/billing/money";
import { HttpError } from "@/lib/http/errors";
import { heldPaymentForReturn } from "@/lib/payments/reconcile";
import type { UnappliedReason } from "@/lib/payments/reasons";

export const metadata = { title: "Payment" };

/** Why a payment was held, in the customer's words (the shop's list has its own). */
const HELD_BECAUSE: Partial<Record<UnappliedReason, string>> = {
  "invoice-settled": "the invoice had already been paid",
  "invoice-void": "the invoice had been cancelled",
  "over-owed": "it was more than was still owed on the invoice",
  "currency-mismatch": "it was in another currency than the invoice",
  "session-closed": "the payment page had been closed by the shop",
};

/**
 * Shows what our database says about the invoice. The redirect back from the payment page proves
 * nothing; only the provider's signed notification marks an invoice paid.
 */
export default async function PayReturnPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { invoice: raw, result, session_id: sessionId } = await searchParams;
  // Signed out on the way back (another browser, an expired session): sign-in returns here.
  const returnTo = `/pay/return?invoice=${encodeURIComponent(raw ?? "")}${
    result === "success" || result === "cancelled" ? `&result=${result}` : ""
  }${sessionId ? `&session_id=${encodeURIComponent(sessionId)}` : ""}`;
  const user = await requirePagePermission("pay-invoice", returnTo);
  const id = Number(raw);
  if (!raw || !/^\d{1,12}$/.test(raw) || !Number.isSafeInteger(id) || id < 1) notFound();
  const invoice = await findInvoiceForUser(getDb(), id, user).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  // A payment received on this page but held for the shop to apply or refund (see the webhook).
  const held =
    result === "success" && sessionId && /^[\w-]{1,200}$/.test(sessionId)
      ? await heldPaymentForReturn(getDb(), invoice.id, sessionId)
      : undefined;
  const paid = invoice.status === "paid";
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  return (
    <section className="panel space-y-4 p-6" data-testid="pay-return">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold">
          Invoice <span className="font-mono">{invoice.number}</span>
        </h1>
        <BillingStatus kind="invoice" status={invoice.status} />
      </div>
      <div aria-live="polite" data-testid="pay-return-state">
        {held && held.status !== "applied" ? (
          <div className="space-y-2" data-testid="pay-return-held">
            <p className="text-lg">
              We received your payment of{" "}
              <strong className="font-mono">{formatMoney(held.amount, held.currency)}</strong>, but
              it has not been put on this invoice
              {HELD_BECAUSE[held.reason as UnappliedReason]
                ? `: ${HELD_BECAUSE[held.reason as UnappliedReason]}`
                : ""}
              .
            </p>
            <p>
              {held.status === "refunded"
                ? "The shop has refunded it."
                : "It is held for the shop, who will apply it to what you owe or refund it. Please do not pay again; the shop will be in touch."}
            </p>
          </div>
        ) : paid ? (
          <p className="text-lg text-within">
            Paid in full: {formatMoney(invoice.total, invoice.currency)}. Thank you.
          </p>
        ) : result === "cancelled" ? (
          <p className="text-lg">
            The payment was not completed and nothing was taken. Still owed:{" "}
            <strong className="font-mono">{formatMoney(owed, invoice.currency)}</strong>.
          </p>
        ) : invoice.status === "issued" ? (
          <>
            <p className="text-lg">
              Not paid yet: {formatMoney(owed, invoice.currency)} still owed.
            </p>
            {result === "success" ? (
              <p className="text-sm text-graphite-600">
                If you have just paid, the confirmation from the payment service can take a few
                moments; this page checks again by itself.
              </p>
            ) : null}
            {result === "success" ? <RefreshWhileWaiting /> : null}
          </>
        ) : (
          <p className="text-lg">This invoice is {invoice.status}: there is nothing to pay.</p>
        )}
      </div>
      <Link href={`/jobs/${invoice.jobId}/billing`} className="btn-secondary">
        Back to job {invoice.jobNumber}
      </Link>
    </section>
  );
}
