import Link from "next/link";
import type { ReactNode } from "react";
import { INVOICE_STATUS_LABEL, QUOTE_STATUS_LABEL } from "@/components/billing/labels";
import { STATUS_LABEL } from "@/components/jobs/status";
import type { Job } from "@/db/jobs";
import type { JobStatus } from "@/db/schema";
import type { JobBilling } from "@/lib/billing/job-billing";
import { formatMoney } from "@/lib/billing/format";
import { subtractMoney } from "@/lib/billing/money";

/** Where the job stands, as the customer reads it. */
const STATE_WORDS: Record<JobStatus, string> = {
  booked: "Your parts are booked in and waiting for the bench.",
  weighing: "Your parts are being weighed.",
  machining: "Your parts are being machined to match.",
  balancing: "The rotating assembly is on the balancer.",
  checking: "The shop is making its final checks.",
  ready: "Your parts are ready to collect.",
  collected: "Collected. Thank you.",
};

/**
 * The customer's own page for a job: where it stands and when it is promised, what was done in
 * plain words, the balance cards, the quote and the invoice with what is owed. None of the
 * bench's working (weights, plan, bobweight sheet, crank readings) is shown or linked.
 */
export function CustomerJob({
  job,
  workDone,
  billing,
  cards,
  promised,
}: {
  job: Job;
  workDone: string[];
  billing: Pick<JobBilling, "quotes" | "invoices">;
  /** The card panel, rendered by the page (it reads the cards the customer may open). */
  cards: ReactNode;
  /** The promised date as the shop shows dates, or null. */
  promised: string | null;
}) {
  const quotes = billing.quotes.filter((q) => q.status !== "draft");
  const invoices = billing.invoices.filter((i) => i.status !== "draft");
  return (
    <div className="space-y-6" data-testid="customer-job">
      <section className="panel p-4" aria-labelledby="job-state">
        <h2 id="job-state" className="mb-2 font-semibold">
          Where your job stands
        </h2>
        <p className="text-lg">{STATE_WORDS[job.status]}</p>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-graphite-500">State</dt>
          <dd>{STATUS_LABEL[job.status]}</dd>
          <dt className="text-graphite-500">Promised for</dt>
          <dd>{promised ?? "No date promised yet"}</dd>
          <dt className="text-graphite-500">Engine</dt>
          <dd>{job.engine}</dd>
        </dl>
      </section>

      <section className="panel p-4" aria-labelledby="work-done">
        <h2 id="work-done" className="mb-2 font-semibold">
          What was done
        </h2>
        {workDone.length === 0 ? (
          <p className="text-sm text-graphite-600">Nothing recorded yet.</p>
        ) : (
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {workDone.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        )}
      </section>

      {cards}

      <section className="panel p-4" aria-labelledby="money">
        <h2 id="money" className="mb-2 font-semibold">
          Quote and invoice
        </h2>
        {quotes.length === 0 && invoices.length === 0 ? (
          <p className="text-sm text-graphite-600">No quote or invoice yet.</p>
        ) : (
          <ul className="space-y-1 text-sm">
            {quotes.map((q) => (
              <li key={`q${q.id}`}>
                Quote <span className="font-mono">{q.number}</span>:{" "}
                {formatMoney(q.total, q.currency)} · {QUOTE_STATUS_LABEL[q.status]}
              </li>
            ))}
            {invoices.map((i) => {
              const owed = subtractMoney(i.total, i.amountPaid);
              return (
                <li key={`i${i.id}`}>
                  Invoice <span className="font-mono">{i.number}</span>:{" "}
                  {formatMoney(i.total, i.currency)} · {INVOICE_STATUS_LABEL[i.status]}
                  {i.status === "issued" ? ` · ${formatMoney(owed, i.currency)} to pay` : ""}
                </li>
              );
            })}
          </ul>
        )}
        <Link href={`/jobs/${job.id}/billing`} className="btn-secondary mt-3 inline-block">
          {invoices.some((i) => i.status === "issued")
            ? "See and pay the invoice"
            : "See the quote and invoice"}
        </Link>
      </section>

      <p className="rounded border border-brass-300 bg-brass-50 p-3 text-sm text-brass-700">
        A rotating assembly that fails at speed can kill. Follow the engine maker&apos;s figures
        when you assemble and run it, and ask the shop if anything on your balance card is unclear.
      </p>
    </div>
  );
}
