"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { type ReactNode, useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import type { z } from "zod";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import { MANUAL_PAYMENT_METHODS } from "@/db/billing-schema";
import type { PriceItem } from "@/db/prices";
import { ApiError } from "@/lib/api-client";
import type { InvoiceAction, QuoteAction } from "@/lib/billing/actions";
import { formatMoney } from "@/lib/billing/format";
import type { InvoiceView, QuoteView } from "@/lib/billing/job-billing";
import { subtractMoney } from "@/lib/billing/money";
import { manualPaymentSchema } from "@/lib/validation/billing";
import { BillingStatus } from "./billing-status";
import { DocumentLines } from "./document-lines";
import { PAYMENT_METHOD_LABEL } from "./labels";
import { LinesForm, type LinesPayload } from "./lines-form";
import { jobBillingKey, useBillingWrite } from "./use-job-billing";

/** A quote or an invoice, with the one set of moves the server says this person may make. */
export type BillingDoc = { kind: "quote"; doc: QuoteView } | { kind: "invoice"; doc: InvoiceView };

export type Action = QuoteAction | InvoiceAction;

/** What the last move came to, shown under the document (or where the panel puts it). */
export interface Outcome {
  ok: boolean;
  message: string;
  error?: unknown;
}

/** What each move is called on its button and says when done, and where it goes. */
function moveOf(
  d: BillingDoc,
  action: Action,
  customerView: boolean,
): { label: string; done: string; url: string; method: string; body?: unknown } | null {
  if (d.kind === "quote") {
    const q = d.doc;
    switch (action) {
      case "offer":
        return {
          label: "Offer to the customer",
          done: "The customer can now see and accept this quote.",
          url: `/api/quotes/${q.id}/offer`,
          method: "POST",
        };
      case "accept":
        return customerView
          ? {
              label: "Accept this quote",
              done: "Thank you: the shop has your go-ahead.",
              url: `/api/quotes/${q.id}/accept`,
              method: "POST",
            }
          : {
              label: "Record acceptance",
              done: "Acceptance recorded.",
              url: `/api/quotes/${q.id}/accept`,
              method: "POST",
            };
      case "withdraw":
        return {
          label: "Withdraw",
          done: "Quote withdrawn.",
          url: `/api/quotes/${q.id}/withdraw`,
          method: "POST",
        };
      case "invoice":
        return {
          label: `Make invoice from quote ${q.number}`,
          done: `Draft invoice made from quote ${q.number}.`,
          url: "/api/invoices",
          method: "POST",
          body: { jobId: q.jobId, quoteId: q.id },
        };
      default:
        return null;
    }
  }
  const i = d.doc;
  switch (action) {
    case "issue":
      return {
        label: "Issue invoice",
        done: "Invoice issued.",
        url: `/api/invoices/${i.id}/issue`,
        method: "POST",
      };
    case "delete":
      return {
        label: "Throw away draft",
        done: "Draft thrown away.",
        url: `/api/invoices/${i.id}`,
        method: "DELETE",
      };
    case "void":
      return {
        label: "Void",
        done: "Invoice voided.",
        url: `/api/invoices/${i.id}/void`,
        method: "POST",
      };
    case "pay-online":
      return {
        label: customerView ? "Pay online" : "Open online payment",
        done: "Opening the payment page…",
        url: `/api/invoices/${i.id}/checkout`,
        method: "POST",
      };
    default:
      return null;
  }
}

/** The moves that are buttons (saving lines and taking money have their own forms). */
const BUTTONS: readonly Action[] = [
  "offer",
  "accept",
  "issue",
  "pay-online",
  "invoice",
  "withdraw",
  "void",
  "delete",
];
/** Moves that undo or throw away: never the main button, whatever else is offered. */
const GOING_BACK: readonly Action[] = ["withdraw", "void", "delete"];
/** Moves that wait for saved lines: they act on what is stored, not on what is typed. */
const NEEDS_SAVED_LINES: readonly Action[] = ["offer", "accept", "issue"];

/**
 * The one place a document (or the panel) says how the last move went; the next move replaces
 * it. With nothing to report, unsaved lines are mentioned here instead of in a second line.
 */
export function StatusLine({
  outcome,
  testId,
  unsaved = false,
}: {
  outcome: Outcome | null;
  testId: string;
  unsaved?: boolean;
}) {
  return (
    <div aria-live="polite" className="min-h-6 text-sm" data-testid={testId}>
      {outcome ? (
        <p className={outcome.ok ? "text-within" : "text-replace"}>{outcome.message}</p>
      ) : unsaved ? (
        <p className="text-machine">Lines changed: save them before going on.</p>
      ) : null}
    </div>
  );
}

/** A refusal as one line in the counter's words: the message, and each field named. */
export function refusalText(e: unknown): string {
  if (!(e instanceof ApiError)) return "Something went wrong. Try again.";
  const fields = Object.entries(e.fields)
    .map(([k, m]) => {
      const line = /^lines\.(\d+)\./.exec(k);
      return line ? `Line ${Number(line[1]) + 1}: ${m}` : m;
    })
    .join(" ");
  return [e.message, fields].filter(Boolean).join(" ");
}

/**
 * One quote or invoice: its number, state and dates, its lines (a form while the person may
 * change them, else read only), payments and what is owed, and one row of buttons built from
 * `allowedActions` as the server sent them.
 */
export function BillingDocument({
  item,
  jobId,
  prices,
  cylinders,
  customerView,
  day,
  heading,
  messageTestId,
  outcome,
  report,
}: {
  item: BillingDoc;
  jobId: number;
  prices: PriceItem[];
  cylinders: number | null;
  customerView: boolean;
  /** An instant as the shop's calendar date. */
  day: (iso: string | null) => string;
  heading: ReactNode;
  messageTestId: string;
  /** The outcome shown under this document (the panel keeps it, so it outlives a re-render). */
  outcome: Outcome | null;
  /** Tells the panel how a move went; the panel decides where it is shown. */
  report: (action: Action, outcome: Outcome | null) => void;
}) {
  const write = useBillingWrite<{ url?: string; paid?: boolean }>(jobId);
  const client = useQueryClient();
  const [leaving, setLeaving] = useState(false);
  const [unsaved, setUnsaved] = useState(false);
  // Changing the lines is the next move: whatever the last one said gives way to "Lines changed".
  const linesChanged = (dirty: boolean) => {
    setUnsaved(dirty);
    if (dirty) report("save-lines", null);
  };
  const { kind, doc } = item;
  const allowed = doc.allowedActions as readonly Action[];
  const what = kind === "quote" ? "this quote" : "this invoice";
  const busy = write.isPending || leaving;

  const run = async (
    action: Action,
    call: { url: string; method: string; body?: unknown },
    done: string | ((data: { url?: string; paid?: boolean }) => string),
  ): Promise<Record<string, string> | null> => {
    report(action, null);
    try {
      const data = await write.mutateAsync(call);
      report(action, { ok: true, message: typeof done === "string" ? done : done(data ?? {}) });
      return null;
    } catch (e) {
      report(action, { ok: false, message: refusalText(e), error: e });
      return e instanceof ApiError ? e.fields : null;
    }
  };

  const act = async (action: Action) => {
    const move = moveOf(item, action, customerView);
    if (!move) return;
    if (action === "pay-online") {
      setLeaving(true);
      report(action, null);
      try {
        const data = await write.mutateAsync(move);
        report(action, { ok: true, message: move.done });
        window.location.assign(data.url!);
      } catch (e) {
        setLeaving(false);
        report(action, { ok: false, message: refusalText(e), error: e });
      }
      return;
    }
    await run(action, move, move.done);
  };

  const buttons = (dirty: boolean) =>
    BUTTONS.filter((a) => allowed.includes(a)).map((a, n) => {
      const move = moveOf(item, a, customerView)!;
      return (
        <button
          key={a}
          type="button"
          className={n === 0 && !GOING_BACK.includes(a) ? "btn-primary" : "btn-secondary"}
          disabled={busy || (dirty && NEEDS_SAVED_LINES.includes(a))}
          onClick={() => void act(a)}
        >
          {move.label}
        </button>
      );
    });

  const invoice = kind === "invoice" ? doc : null;
  const owed = invoice ? subtractMoney(invoice.total, invoice.amountPaid) : "0";
  const money = (a: string) => formatMoney(a, doc.currency);
  const saveUrl = kind === "quote" ? `/api/quotes/${doc.id}` : `/api/invoices/${doc.id}`;

  return (
    <>
      <div className="flex flex-wrap items-center gap-3">
        {heading}
        {kind === "quote" ? (
          <BillingStatus kind="quote" status={doc.status} customerView={customerView} />
        ) : (
          <BillingStatus kind="invoice" status={doc.status} />
        )}
        {kind === "quote" && doc.status === "accepted" ? (
          <span className="text-sm text-graphite-600">on {day(doc.acceptedAt)}</span>
        ) : null}
        {invoice?.issuedAt ? (
          <span className="text-sm text-graphite-600">issued {day(invoice.issuedAt)}</span>
        ) : null}
        {invoice?.paidAt ? (
          <span className="text-sm text-graphite-600">paid {day(invoice.paidAt)}</span>
        ) : null}
        {invoice ? (
          <a
            className="ml-auto text-sm underline underline-offset-4"
            href={`/api/invoices/${invoice.id}/pdf`}
            target="_blank"
            rel="noreferrer"
          >
            {invoice.status === "draft" ? "Preview PDF" : "PDF"}
          </a>
        ) : null}
      </div>

      {allowed.includes("save-lines") ? (
        <LinesForm
          key={doc.version}
          document={doc}
          prices={prices}
          cylinders={cylinders}
          busy={busy}
          onSave={(payload: LinesPayload) =>
            run("save-lines", { url: saveUrl, method: "PUT", body: payload }, "Lines saved.")
          }
          actions={buttons}
          onDirtyChange={linesChanged}
        />
      ) : (
        <>
          <DocumentLines
            lines={doc.lines}
            currency={doc.currency}
            subtotal={doc.subtotal}
            taxRate={doc.taxRate}
            tax={doc.tax}
            total={doc.total}
          />
          {kind === "quote" && customerView && allowed.includes("accept") ? (
            <p className="text-sm text-graphite-600">
              Accepting asks the shop to do this work at these prices. Tax is charged at the rate in
              force when the invoice is issued.
            </p>
          ) : null}
        </>
      )}

      {invoice?.status === "draft" ? (
        <p className="text-xs text-graphite-500">
          The number is given and the shop&apos;s tax rate applied when the invoice is issued.
        </p>
      ) : null}

      {invoice && invoice.payments.length > 0 ? (
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

      {invoice?.status === "issued" ? (
        <p className="text-sm">
          Still owed:{" "}
          <strong className="font-mono" data-testid="still-owed">
            {money(owed)}
          </strong>
        </p>
      ) : null}

      {!allowed.includes("save-lines") && buttons(false).length > 0 ? (
        <div className="flex flex-wrap items-center gap-3">{buttons(false)}</div>
      ) : null}

      {invoice && allowed.includes("record-payment") ? (
        <RecordPaymentForm
          key={owed}
          owed={owed}
          busy={busy}
          onRecord={(body) =>
            run(
              "record-payment",
              { url: `/api/invoices/${invoice.id}/payments`, method: "POST", body },
              (data) =>
                data.paid ? "Payment recorded: the invoice is paid." : "Payment recorded.",
            )
          }
        />
      ) : null}

      {outcome && !outcome.ok && isStaleWrite(outcome.error) ? (
        <ChangedElsewhere
          what={what}
          error={outcome.error}
          onReload={() => {
            report("save-lines", null);
            void client.invalidateQueries({ queryKey: jobBillingKey(jobId) });
          }}
        />
      ) : (
        <StatusLine outcome={outcome} testId={messageTestId} unsaved={unsaved} />
      )}
    </>
  );
}

type PaymentValues = {
  method: (typeof MANUAL_PAYMENT_METHODS)[number];
  amount: string;
  reference: string;
};
type PaymentPayload = z.output<typeof manualPaymentSchema>;

/** Money taken at the counter, checked with the server's own schema before it is sent. */
function RecordPaymentForm({
  owed,
  busy,
  onRecord,
}: {
  owed: string;
  busy: boolean;
  onRecord: (body: PaymentPayload) => Promise<Record<string, string> | null>;
}) {
  const form = useForm<PaymentValues, unknown, PaymentPayload>({
    resolver: zodResolver(manualPaymentSchema) as unknown as Resolver<
      PaymentValues,
      unknown,
      PaymentPayload
    >,
    defaultValues: { method: "cash", amount: owed, reference: "" },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit(async (body) => {
    const refused = await onRecord(body);
    for (const [key, message] of Object.entries(refused ?? {})) {
      form.setError(key as keyof PaymentValues, { message });
    }
  });
  return (
    <form
      className="flex flex-wrap items-end gap-3 rounded border border-graphite-200 bg-graphite-50 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <p className="w-full text-sm font-semibold">Record money taken at the counter</p>
      <label className="text-sm">
        <span className="mb-1 block">How</span>
        <select className="field-input w-44 py-1" {...form.register("method")}>
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
          className={`field-input w-32 py-1 text-right font-mono ${errors.amount ? "border-replace" : ""}`}
          inputMode="decimal"
          aria-invalid={errors.amount ? true : undefined}
          {...form.register("amount")}
        />
      </label>
      <label className="text-sm">
        <span className="mb-1 block">Reference (slip, transfer id)</span>
        <input className="field-input w-56 py-1" maxLength={120} {...form.register("reference")} />
      </label>
      <button type="submit" className="btn-secondary" disabled={busy}>
        Record payment
      </button>
      {errors.amount || errors.method || errors.reference ? (
        <p className="w-full text-sm text-replace">
          {[errors.method?.message, errors.amount?.message, errors.reference?.message]
            .filter(Boolean)
            .join(" ")}
        </p>
      ) : null}
    </form>
  );
}
