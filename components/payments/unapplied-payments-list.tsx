"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { UnappliedPaymentListed } from "@/db/payments";
import { formatMoney } from "@/lib/billing/format";
import { shopDateTime } from "@/lib/dates/shop-time";
import { PaymentReason } from "./payment-reason";
import { UnappliedPaymentActions } from "./unapplied-payment-actions";

const STATE_LABEL: Record<UnappliedPaymentListed["status"], string> = {
  open: "To reconcile",
  applied: "Applied",
  refunded: "Refunded",
};

/** The counter's list of online payments kept to reconcile, each with its actions while open. */
export function UnappliedPaymentsList({
  items,
  timeZone,
}: {
  items: UnappliedPaymentListed[];
  timeZone: string;
}) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  return (
    <div className="space-y-3">
      <div aria-live="polite" className="min-h-6 text-sm" data-testid="reconcile-message">
        {message ? <p className="text-within">{message}</p> : null}
      </div>
      {items.length === 0 ? (
        <p className="panel p-4 text-sm text-graphite-600">Nothing to show.</p>
      ) : null}
      <ul className="space-y-3">
        {items.map((item) => (
          <li
            key={item.id}
            className="panel space-y-2 p-4"
            data-testid={`unapplied-payment-${item.id}`}
          >
            <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
              <strong className="font-mono text-lg">
                {formatMoney(item.amount, item.currency)}
              </strong>
              <span className="text-sm">
                {item.invoiceNumber && item.jobId !== null ? (
                  <>
                    for{" "}
                    <Link
                      href={`/jobs/${item.jobId}/billing`}
                      className="font-mono underline underline-offset-4"
                    >
                      {item.invoiceNumber}
                    </Link>
                  </>
                ) : (
                  "for no invoice of ours"
                )}
              </span>
              <span className="text-sm text-graphite-600">
                received {shopDateTime(item.receivedAt, timeZone)}
              </span>
              <span className="ml-auto text-sm font-semibold" data-testid="unapplied-state">
                {STATE_LABEL[item.status]}
              </span>
            </div>
            <PaymentReason reason={item.reason} reference={item.reference} />
            {item.status === "open" ? (
              <UnappliedPaymentActions
                item={item}
                onReload={() => router.refresh()}
                onDone={(done) => {
                  setMessage(done);
                  router.refresh();
                }}
              />
            ) : (
              <p className="text-sm text-graphite-600">
                {item.status === "applied" ? "Applied" : "Marked refunded"}
                {item.resolvedByName ? ` by ${item.resolvedByName}` : ""}
                {item.resolvedAt ? ` on ${shopDateTime(item.resolvedAt, timeZone)}` : ""}
                {item.note ? `: ${item.note}` : "."}
              </p>
            )}
          </li>
        ))}
      </ul>
    </div>
  );
}
