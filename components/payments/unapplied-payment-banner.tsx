"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useState } from "react";
import type { UnappliedPaymentListed } from "@/db/payments";
import { formatMoney } from "@/lib/billing/format";
import { callPayments } from "./call";
import { PaymentReason } from "./payment-reason";
import { UnappliedPaymentActions } from "./unapplied-payment-actions";

/**
 * On an invoice, for the counter and the owner: each online payment received for it and not
 * applied, in plain words, with "Apply as payment" and "Mark refunded". Reads its own data, so it
 * can sit in any invoice view; shows nothing when there is none, or to someone who may not settle
 * payments. `onChanged` runs after either action worked (the invoice view reloads its figures);
 * without it the page's server data is refreshed.
 */
export function UnappliedPaymentBanner({
  invoiceId,
  onChanged,
}: {
  invoiceId: number;
  onChanged?: () => void;
}) {
  const router = useRouter();
  const [items, setItems] = useState<UnappliedPaymentListed[]>([]);
  const [message, setMessage] = useState<string | null>(null);
  const [failed, setFailed] = useState<string | null>(null);

  const load = useCallback(async () => {
    const outcome = await callPayments<{ payments: UnappliedPaymentListed[] }>(
      `/api/payments/unapplied?invoiceId=${invoiceId}&status=open`,
      "GET",
    );
    if (outcome.ok) {
      setItems(outcome.data.payments);
      setFailed(null);
    } else if (outcome.status === 401 || outcome.status === 403) {
      setItems([]);
    } else {
      setFailed(`Could not check for online payments not applied: ${outcome.message}`);
    }
  }, [invoiceId]);

  useEffect(() => {
    void load();
  }, [load]);

  if (failed) {
    return (
      <p className="text-sm text-replace" role="status">
        {failed}
      </p>
    );
  }
  if (items.length === 0) {
    return message ? (
      <p className="text-sm text-within" role="status" data-testid="unapplied-payment-message">
        {message}
      </p>
    ) : null;
  }
  return (
    <div className="space-y-2">
      {items.map((item) => (
        <div
          key={item.id}
          role="alert"
          className="space-y-2 rounded border-2 border-replace bg-white p-3"
          data-testid="unapplied-payment-banner"
        >
          <p className="font-semibold">
            A payment of{" "}
            <span className="font-mono">{formatMoney(item.amount, item.currency)}</span> was
            received online and not applied: refund it or apply it.
          </p>
          <PaymentReason reason={item.reason} reference={item.reference}>
            <Link href="/invoices/reconcile" className="underline underline-offset-4">
              All payments to reconcile
            </Link>
          </PaymentReason>
          <UnappliedPaymentActions
            item={item}
            onReload={() => {
              void load();
              if (onChanged) onChanged();
              else router.refresh();
            }}
            onDone={(done) => {
              setMessage(done);
              void load();
              if (onChanged) onChanged();
              else router.refresh();
            }}
          />
        </div>
      ))}
    </div>
  );
}
