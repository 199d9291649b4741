"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { MANUAL_PAYMENT_METHODS } from "@/db/billing-schema";
import type { PriceItem } from "@/db/prices";
import type { Quote } from "@/db/quotes";
import { formatMoney } from "@/lib/billing/format";
import type { InvoiceWithPayments } from "@/lib/billing/job-billing";
import { compareMoney, subtractMoney } from "@/lib/billing/money";
import { UnappliedPaymentBanner } from "@/components/payments/unapplied-payment-banner";
import { shopDate } from "@/lib/dates/shop-time";
import { callApi } from "./api";
import { BillingStatus } from "./billing-status";
import { DocumentLines } from "./document-lines";
import { PAYMENT_METHOD_LABEL } from "./labels";
import { type LinePayload, LinesEditor } from "./lines-editor";

type Role = "staff" | "customer";

interface Status {
  ok: boolean;
  message: string;
}

/** Runs one call at a time, shows its outcome, and reloads the page's data when it worked. */
function useRunner() {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [status, setStatus] = useState<Status | null>(null);
  async function run<T>(
    call: () => Promise<{ ok: true; data: T } | { ok: false; message: string }>,
    done: string | ((data: T) => string | null),
  ) {
    setBusy(true);
    setStatus(null);
    const outcome = await call();
    setBusy(false);
    if (!outcome.ok) return setStatus({ ok: false, message: outcome.message });
    const message = typeof done === "string" ? done : done(outcome.data);
    if (message) setStatus({ ok: true, message });
    router.refresh();
  }
  return { busy, status, run };
}

function StatusLine({ status, testId }: { status: Status | null; testId: string }) {
  return (
    <div aria-live="polite" className="min-h-6 text-sm" data-testid={testId}>
      {status ? (
        <p className={status.ok ? "text-within" : "text-replace"}>{status.message}</p>
      ) : null}
    </div>
  );
}

const dayIn = (timeZone: string) => (iso: string | null) =>
  iso ? shopDate(new Date(iso), timeZone) : "";

export function JobBillingPanel({
  jobId,
  role,
  quotes,
  invoices,
  prices,
  currency,
  timeZone,
}: {
  jobId: number;
  role: Role;
  quotes: Quote[];
  invoices: InvoiceWithPayments[];
  prices: PriceItem[];
  currency: string;
  /** The shop's time zone: dates are the shop's calendar dates. */
  timeZone: string;
}) {
  const live = quotes.find((q) => q.status !== "withdrawn");
  const past = quotes.filter((q) => q !== live);
  return (
    <div className="space-y-6">
      <QuoteSection
        jobId={jobId}
        role={role}
        quote={live}
        past={past}
        prices={prices}
        currency={currency}
        day={dayIn(timeZone)}
      />
      <InvoiceSection
        jobId={jobId}
        role={role}
        quote={live}
        invoices={invoices}
        prices={prices}
        day={dayIn(timeZone)}
      />
    </div>
  );
}

function QuoteSection({
  jobId,
  role,
  quote,
  past,
  prices,
  currency,
  day,
}: {
  jobId: number;
  role: Role;
  quote: Quote | undefined;
  past: Quote[];
  prices: PriceItem[];
  currency: string;
  day: (iso: string | null) => string;
}) {
  const { busy, status, run } = useRunner();
  const staff = role === "staff";
  const move = (action: "offer" | "accept" | "withdraw", done: string) =>
    run(() => callApi<{ quote: Quote }>(`/api/quotes/${quote!.id}/${action}`, "POST"), done);

  return (
    <section className="panel space-y-3 p-4" aria-labelledby="quote-heading">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="quote-heading" className="text-lg font-semibold">
          Quote {quote ? <span className="font-mono">{quote.number}</span> : null}
        </h2>
        {quote ? <BillingStatus kind="quote" status={quote.status} /> : null}
        {quote?.status === "accepted" ? (
          <span className="text-sm text-graphite-600">on {day(quote.acceptedAt)}</span>
        ) : null}
      </div>

      {!quote ? (
        staff ? (
          <button
            type="button"
            className="btn-primary"
            disabled={busy}
            onClick={() =>
              run(
                () => callApi("/api/quotes", "POST", { jobId, lines: [] }),
                "Quote started: add its lines.",
              )
            }
          >
            Start a quote
          </button>
        ) : (
          <p className="text-sm text-graphite-600">
            The shop has not sent a quote for this job yet.
          </p>
        )
      ) : quote.status === "draft" && staff ? (
        <LinesEditor
          key={quote.version}
          lines={quote.lines}
          prices={prices}
          currency={quote.currency}
          taxRate={quote.taxRate}
          busy={busy}
          onSave={(lines: LinePayload[]) =>
            run(
              () => callApi(`/api/quotes/${quote.id}`, "PUT", { version: quote.version, lines }),
              "Lines saved.",
            )
          }
          actions={(dirty) => (
            <>
              <button
                type="button"
                className="btn-primary"
                disabled={busy || dirty || quote.lines.length === 0}
                onClick={() => move("offer", "The customer can now see and accept this quote.")}
              >
                Offer to the customer
              </button>
              <button
                type="button"
                className="btn-secondary"
                disabled={busy || dirty || quote.lines.length === 0}
                onClick={() => move("accept", "Acceptance recorded.")}
              >
                Record acceptance
              </button>
              <button
                type="button"
                className="btn-secondary"
                disabled={busy}
                onClick={() => move("withdraw", "Quote withdrawn.")}
              >
                Withdraw
              </button>
            </>
          )}
        />
      ) : (
        <>
          <DocumentLines
            lines={quote.lines}
            currency={quote.currency}
            subtotal={quote.subtotal}
            taxRate={quote.taxRate}
            tax={quote.tax}
            total={quote.total}
          />
          {quote.status === "offered" ? (
            <div className="flex flex-wrap items-center gap-3">
              {!staff ? (
                <>
                  <button
                    type="button"
                    className="btn-primary"
                    disabled={busy}
                    onClick={() => move("accept", "Thank you: the shop has your go-ahead.")}
                  >
                    Accept this quote
                  </button>
                  <p className="text-sm text-graphite-600">
                    Accepting asks the shop to do this work at these prices. Tax is charged at the
                    rate in force when the invoice is issued.
                  </p>
                </>
              ) : (
                <>
                  <button
                    type="button"
                    className="btn-primary"
                    disabled={busy}
                    onClick={() => move("accept", "Acceptance recorded.")}
                  >
                    Record acceptance
                  </button>
                  <button
                    type="button"
                    className="btn-secondary"
                    disabled={busy}
                    onClick={() => move("withdraw", "Quote withdrawn.")}
                  >
                    Withdraw
                  </button>
                </>
              )}
            </div>
          ) : null}
        </>
      )}
      <StatusLine status={status} testId="quote-message" />
      {past.length > 0 ? (
        <p className="text-xs text-graphite-500">
          Earlier quotes:{" "}
          {past
            .map((q) => `${q.number} (${q.status}, ${formatMoney(q.total, currency)})`)
            .join(", ")}
        </p>
      ) : null}
    </section>
  );
}

function InvoiceSection({
  jobId,
  role,
  quote,
  invoices,
  prices,
  day,
}: {
  jobId: number;
  role: Role;
  quote: Quote | undefined;
  invoices: InvoiceWithPayments[];
  prices: PriceItem[];
  day: (iso: string | null) => string;
}) {
  const { busy, status, run } = useRunner();
  const staff = role === "staff";
  const quoteInvoiced = invoices.some((i) => i.quoteId === quote?.id && i.status !== "void");
  return (
    <section className="space-y-4" aria-labelledby="invoice-heading">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="invoice-heading" className="text-lg font-semibold">
          Invoices
        </h2>
        {staff && quote?.status === "accepted" && !quoteInvoiced ? (
          <button
            type="button"
            className="btn-primary"
            disabled={busy}
            onClick={() =>
              run(
                () => callApi("/api/invoices", "POST", { jobId, quoteId: quote.id }),
                `Draft invoice made from quote ${quote.number}.`,
              )
            }
          >
            Make invoice from quote {quote.number}
          </button>
        ) : null}
        {staff ? (
          <button
            type="button"
            className="btn-secondary"
            disabled={busy}
            onClick={() =>
              run(
                () => callApi("/api/invoices", "POST", { jobId, lines: [] }),
                "Draft invoice started.",
              )
            }
          >
            New invoice from the price list
          </button>
        ) : null}
      </div>
      <StatusLine status={status} testId="invoices-message" />
      {invoices.length === 0 ? (
        <p className="text-sm text-graphite-600">No invoices for this job yet.</p>
      ) : null}
      {invoices.map((inv) => (
        <InvoiceCard key={inv.id} invoice={inv} role={role} prices={prices} day={day} />
      ))}
    </section>
  );
}

function InvoiceCard({
  invoice,
  role,
  prices,
  day,
}: {
  invoice: InvoiceWithPayments;
  role: Role;
  prices: PriceItem[];
  day: (iso: string | null) => string;
}) {
  const { busy, status, run } = useRunner();
  const [redirecting, setRedirecting] = useState(false);
  const staff = role === "staff";
  const owed = subtractMoney(invoice.total, invoice.amountPaid);
  const money = (a: string) => formatMoney(a, invoice.currency);
  const post = (action: "issue" | "void", done: string) =>
    run(() => callApi(`/api/invoices/${invoice.id}/${action}`, "POST"), done);

  const payOnline = async () => {
    setRedirecting(true);
    await run(
      () =>
        callApi<{ url: string }>(`/api/invoices/${invoice.id}/checkout`, "POST").then((o) => {
          if (o.ok) window.location.assign(o.data.url);
          else setRedirecting(false);
          return o;
        }),
      () => "Opening the payment page…",
    );
  };

  return (
    <article className="panel space-y-3 p-4" data-testid={`invoice-${invoice.id}`}>
      <div className="flex flex-wrap items-center gap-3">
        <h3 className="font-semibold">
          {invoice.number ? (
            <span className="font-mono">{invoice.number}</span>
          ) : (
            `Draft invoice ${invoice.id}`
          )}
        </h3>
        <BillingStatus kind="invoice" status={invoice.status} />
        {invoice.issuedAt ? (
          <span className="text-sm text-graphite-600">issued {day(invoice.issuedAt)}</span>
        ) : null}
        {invoice.paidAt ? (
          <span className="text-sm text-graphite-600">paid {day(invoice.paidAt)}</span>
        ) : null}
        <a
          className="ml-auto text-sm underline underline-offset-4"
          href={`/api/invoices/${invoice.id}/pdf`}
          target="_blank"
          rel="noreferrer"
        >
          {invoice.status === "draft" ? "Preview PDF" : "PDF"}
        </a>
      </div>
      {staff && invoice.status !== "draft" ? (
        <UnappliedPaymentBanner invoiceId={invoice.id} />
      ) : null}

      {invoice.status === "draft" && staff ? (
        <LinesEditor
          key={invoice.version}
          lines={invoice.lines}
          prices={prices}
          currency={invoice.currency}
          taxRate={invoice.taxRate}
          busy={busy}
          onSave={(lines) =>
            run(
              () =>
                callApi(`/api/invoices/${invoice.id}`, "PUT", { version: invoice.version, lines }),
              "Lines saved.",
            )
          }
          actions={(dirty) => (
            <>
              <button
                type="button"
                className="btn-primary"
                disabled={busy || dirty || invoice.lines.length === 0}
                onClick={() => post("issue", "Invoice issued.")}
              >
                Issue invoice
              </button>
              <button
                type="button"
                className="btn-secondary"
                disabled={busy}
                onClick={() =>
                  run(() => callApi(`/api/invoices/${invoice.id}`, "DELETE"), "Draft thrown away.")
                }
              >
                Throw away draft
              </button>
            </>
          )}
        />
      ) : (
        <DocumentLines
          lines={invoice.lines}
          currency={invoice.currency}
          subtotal={invoice.subtotal}
          taxRate={invoice.taxRate}
          tax={invoice.tax}
          total={invoice.total}
        />
      )}

      {invoice.status === "draft" ? (
        <p className="text-xs text-graphite-500">
          The number is given and the shop&apos;s tax rate applied when the invoice is issued.
        </p>
      ) : null}

      {invoice.payments.length > 0 ? (
        <ul className="space-y-1 text-sm" aria-label="Payments received">
          {invoice.payments.map((p) => (
            <li key={p.id} className="flex justify-between border-b border-graphite-100 py-1">
              <span>
                {day(p.receivedAt)} · {PAYMENT_METHOD_LABEL[p.method]}
                {p.reference ? ` · ${p.reference}` : ""}
              </span>
              <span className="font-mono">{money(p.amount)}</span>
            </li>
          ))}
        </ul>
      ) : null}

      {invoice.status === "issued" ? (
        <div className="space-y-3">
          <p className="text-sm">
            Still owed:{" "}
            <strong className="font-mono" data-testid="still-owed">
              {money(owed)}
            </strong>
          </p>
          <div className="flex flex-wrap items-center gap-3">
            <button
              type="button"
              className="btn-primary"
              disabled={busy || redirecting}
              onClick={payOnline}
            >
              {!staff ? "Pay online" : "Open online payment"}
            </button>
            {staff && compareMoney(invoice.amountPaid, "0") === 0 ? (
              <button
                type="button"
                className="btn-secondary"
                disabled={busy}
                onClick={() => post("void", "Invoice voided.")}
              >
                Void
              </button>
            ) : null}
          </div>
          {staff ? (
            <RecordPaymentForm
              key={owed}
              invoiceId={invoice.id}
              owed={owed}
              run={run}
              busy={busy}
            />
          ) : null}
        </div>
      ) : null}
      <StatusLine status={status} testId={`invoice-${invoice.id}-message`} />
    </article>
  );
}

function RecordPaymentForm({
  invoiceId,
  owed,
  run,
  busy,
}: {
  invoiceId: number;
  owed: string;
  run: ReturnType<typeof useRunner>["run"];
  busy: boolean;
}) {
  const [method, setMethod] = useState<(typeof MANUAL_PAYMENT_METHODS)[number]>("cash");
  const [amount, setAmount] = useState(owed);
  const [reference, setReference] = useState("");
  return (
    <form
      className="flex flex-wrap items-end gap-3 rounded border border-graphite-200 bg-graphite-50 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        void run(
          () =>
            callApi<{ paid: boolean }>(`/api/invoices/${invoiceId}/payments`, "POST", {
              method,
              amount: amount.trim(),
              reference: reference.trim() || null,
            }),
          (data) => (data.paid ? "Payment recorded: the invoice is paid." : "Payment recorded."),
        );
      }}
    >
      <p className="w-full text-sm font-semibold">Record money taken at the counter</p>
      <label className="text-sm">
        <span className="mb-1 block">How</span>
        <select
          className="field-input w-44 py-1"
          value={method}
          onChange={(e) => setMethod(e.target.value as typeof method)}
        >
          {MANUAL_PAYMENT_METHODS.map((m) => (
            <option key={m} value={m}>
              {PAYMENT_METHOD_LABEL[m]}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm">
        <span className="mb-1 block">Amount</span>
        <input
          className="field-input w-32 py-1 text-right font-mono"
          inputMode="decimal"
          value={amount}
          onChange={(e) => setAmount(e.target.value)}
        />
      </label>
      <label className="text-sm">
        <span className="mb-1 block">Reference (slip, transfer id)</span>
        <input
          className="field-input w-56 py-1"
          maxLength={120}
          value={reference}
          onChange={(e) => setReference(e.target.value)}
        />
      </label>
      <button type="submit" className="btn-secondary" disabled={busy}>
        Record payment
      </button>
    </form>
  );
}
