"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { UnappliedPaymentBanner } from "@/components/payments/unapplied-payment-banner";
import { formatMoney } from "@/lib/billing/format";
import type { JobBilling } from "@/lib/billing/job-billing";
import { shopDate } from "@/lib/dates/shop-time";
import {
  type Action,
  BillingDocument,
  type Outcome,
  refusalText,
  StatusLine,
} from "./billing-document";
import { jobBillingKey, useBillingWrite, useJobBilling } from "./use-job-billing";

/** Where the panel's one message is shown: under the quote, the invoices' heading or an invoice. */
type Where = "quote" | "invoices" | number;

/**
 * A job's quote and invoices: one document view for both (components/billing/billing-document),
 * read through TanStack Query from `GET /api/jobs/:id/billing` (the page's render is its first
 * answer), each with the moves the server says this person may make.
 */
export function JobBillingPanel({ initial }: { initial: JobBilling }) {
  const { data } = useJobBilling(initial.job.id, initial);
  const billing = data ?? initial;
  const jobId = billing.job.id;
  // One message for the whole panel, kept here, not in the documents: "quote started" outlives
  // the button that said it, and an invoice made from the quote is reported with the invoices.
  // It is shown where the move was made, and the next move, anywhere, replaces it.
  const [said, setSaid] = useState<{ where: Where; outcome: Outcome } | null>(null);
  const say = (where: Where) => (o: Outcome | null) => setSaid(o ? { where, outcome: o } : null);
  const at = (where: Where) => (said?.where === where ? said.outcome : null);
  const day = (iso: string | null) => (iso ? shopDate(new Date(iso), billing.timeZone) : "");
  const live = billing.quotes.find((q) => q.status !== "withdrawn");
  const past = billing.quotes.filter((q) => q !== live);
  const common = {
    jobId,
    prices: billing.prices,
    cylinders: billing.job.spec.cylinders,
    customerView: billing.customerView,
    day,
  };
  const start = useBillingWrite(jobId);
  const queryClient = useQueryClient();
  const startWith = async (
    call: { url: string; body: unknown },
    done: string,
    report: (o: Outcome | null) => void,
  ) => {
    report(null);
    try {
      await start.mutateAsync({ ...call, method: "POST" });
      report({ ok: true, message: done });
    } catch (e) {
      report({ ok: false, message: refusalText(e), error: e });
    }
  };

  return (
    <div className="space-y-6">
      <section className="panel space-y-3 p-4" aria-labelledby="quote-heading">
        {live ? (
          <BillingDocument
            {...common}
            item={{ kind: "quote", doc: live }}
            messageTestId="quote-message"
            outcome={at("quote")}
            report={(action: Action, o) =>
              action === "invoice" ? say("invoices")(o) : say("quote")(o)
            }
            heading={
              <h2 id="quote-heading" className="text-lg font-semibold">
                Quote <span className="whitespace-nowrap font-mono">{live.number}</span>
              </h2>
            }
          />
        ) : (
          <>
            <h2 id="quote-heading" className="text-lg font-semibold">
              Quote
            </h2>
            {billing.canStart.quote ? (
              <button
                type="button"
                className="btn-primary"
                disabled={start.isPending}
                onClick={() =>
                  void startWith(
                    { url: "/api/quotes", body: { jobId, lines: [] } },
                    "Quote started: add its lines.",
                    say("quote"),
                  )
                }
              >
                Start a quote
              </button>
            ) : (
              <p className="text-sm text-graphite-600">
                The shop has not sent a quote for this job yet.
              </p>
            )}
            <StatusLine outcome={at("quote")} testId="quote-message" />
          </>
        )}
        {past.length > 0 ? (
          <p className="text-xs text-graphite-500">
            Earlier quotes:{" "}
            {past
              .map((q) => `${q.number} (${q.status}, ${formatMoney(q.total, q.currency)})`)
              .join(", ")}
          </p>
        ) : null}
      </section>

      <section className="space-y-4" aria-labelledby="invoice-heading">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="invoice-heading" className="text-lg font-semibold">
            Invoices
          </h2>
          {billing.canStart.invoice ? (
            <button
              type="button"
              className="btn-secondary"
              disabled={start.isPending}
              onClick={() =>
                void startWith(
                  { url: "/api/invoices", body: { jobId, lines: [] } },
                  "Draft invoice started.",
                  say("invoices"),
                )
              }
            >
              New invoice from the price list
            </button>
          ) : null}
        </div>
        <StatusLine outcome={at("invoices")} testId="invoices-message" />
        {billing.invoices.length === 0 ? (
          <p className="text-sm text-graphite-600">No invoices for this job yet.</p>
        ) : null}
        {billing.invoices.map((inv) => (
          <article key={inv.id} className="panel space-y-3 p-4" data-testid={`invoice-${inv.id}`}>
            <BillingDocument
              {...common}
              item={{ kind: "invoice", doc: inv }}
              messageTestId={`invoice-${inv.id}-message`}
              outcome={at(inv.id)}
              report={(action, o) =>
                action === "delete" && o?.ok ? say("invoices")(o) : say(inv.id)(o)
              }
              heading={
                <h3 className="font-semibold">
                  {inv.number ? (
                    <span className="whitespace-nowrap font-mono">{inv.number}</span>
                  ) : (
                    `Draft invoice ${inv.id}`
                  )}
                </h3>
              }
            />
            {!billing.customerView && inv.status !== "draft" ? (
              <UnappliedPaymentBanner
                invoiceId={inv.id}
                onChanged={() =>
                  void queryClient.invalidateQueries({ queryKey: jobBillingKey(jobId) })
                }
              />
            ) : null}
          </article>
        ))}
      </section>
    </div>
  );
}
