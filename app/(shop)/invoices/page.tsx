import Link from "next/link";
import type { ReactNode } from "react";
import { BillingStatus } from "@/components/billing/billing-status";
import { INVOICE_STATUS_LABEL } from "@/components/billing/labels";
import { Pager } from "@/components/ui/pager";
import { INVOICE_STATUSES } from "@/db/billing-schema";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { listInvoices } from "@/db/invoices";
import { requirePagePermission } from "@/lib/auth/guard";
import { isCustomer, may } from "@/lib/auth/policy";
import { formatMoney } from "@/lib/billing/format";
import { subtractMoney } from "@/lib/billing/money";
import { shopDate } from "@/lib/dates/shop-time";
import { customerScope } from "@/lib/jobs/access";
import { countPaymentsToReconcile } from "@/lib/payments/reconcile";
import { invoiceListQuerySchema } from "@/lib/validation/billing";

export const metadata = { title: "Invoices" };

export default async function InvoicesPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const user = await requirePagePermission("list-invoices", "/invoices");
  const raw = await searchParams;
  const parsed = invoiceListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : invoiceListQuerySchema.parse({});
  const customerId = customerScope(user);
  // Online payments to reconcile: for the owner and the counter, who apply or refund them.
  const reconciles = may(user, "record-payment");
  const [{ invoices, total }, { timeZone }, toReconcile] = await Promise.all([
    listInvoices(getDb(), {
      customerId,
      excludeDrafts: customerId !== undefined,
      status: query.status,
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
    }),
    findCounterSettings(getDb()),
    reconciles ? countPaymentsToReconcile(getDb()) : Promise.resolve(0),
  ]);
  const statuses = INVOICE_STATUSES.filter((s) => customerId === undefined || s !== "draft");
  // One set of cells for the table (from sm up) and the phone cards; numbers never wrap.
  type Row = (typeof invoices)[number];
  const columns: {
    head: string;
    mono?: boolean;
    right?: boolean;
    cell: (inv: Row) => ReactNode;
  }[] = [
    {
      head: "Invoice",
      mono: true,
      cell: (inv) => (
        <Link
          href={`/jobs/${inv.jobId}/billing`}
          className="underline decoration-graphite-300 underline-offset-4 hover:decoration-brass-500"
        >
          {inv.number ?? `Draft ${inv.id}`}
        </Link>
      ),
    },
    { head: "Job", mono: true, cell: (inv) => inv.jobNumber },
    ...(customerId === undefined
      ? [{ head: "Customer", cell: (inv: Row) => inv.customerName }]
      : []),
    {
      head: "Issued",
      mono: true,
      cell: (inv) => (inv.issuedAt ? shopDate(new Date(inv.issuedAt), timeZone) : "—"),
    },
    {
      head: "Total",
      mono: true,
      right: true,
      cell: (inv) => formatMoney(inv.total, inv.currency),
    },
    {
      head: "Still owed",
      mono: true,
      right: true,
      cell: (inv) =>
        inv.status === "issued"
          ? formatMoney(subtractMoney(inv.total, inv.amountPaid), inv.currency)
          : "—",
    },
    { head: "State", cell: (inv) => <BillingStatus kind="invoice" status={inv.status} /> },
  ];

  return (
    <section>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold">
            {isCustomer(user) ? "Your invoices" : "Invoices"}
          </h1>
          {reconciles ? (
            <Link
              href="/invoices/reconcile"
              className="text-sm underline underline-offset-4"
              data-testid="reconcile-link"
            >
              Online payments to reconcile
              {toReconcile > 0 ? (
                <span
                  className="ml-2 rounded-full bg-brass-100 px-2 py-0.5 font-mono text-xs font-semibold text-graphite-900"
                  data-testid="reconcile-count"
                >
                  {toReconcile}
                  <span className="sr-only"> waiting</span>
                </span>
              ) : null}
            </Link>
          ) : null}
        </div>
        <form className="flex items-end gap-2">
          <label className="text-sm">
            <span className="mb-1 block font-semibold">State</span>
            <select name="status" defaultValue={query.status ?? ""} className="field-input w-48">
              <option value="">Any</option>
              {statuses.map((s) => (
                <option key={s} value={s}>
                  {INVOICE_STATUS_LABEL[s]}
                </option>
              ))}
            </select>
          </label>
          <button className="btn-secondary" type="submit">
            Show
          </button>
        </form>
      </div>
      {/* At phone width each invoice is a card: the same cells, each with its heading. */}
      <ul className="space-y-2 sm:hidden" data-testid="invoice-cards">
        {invoices.map((inv) => (
          <li key={inv.id} className="panel p-3 text-sm" data-testid={`invoice-card-${inv.id}`}>
            <dl className="grid grid-cols-[6rem_1fr] gap-x-3 gap-y-1">
              {columns.map((c) => (
                <div key={c.head} className="contents">
                  <dt className="text-graphite-500">{c.head}</dt>
                  <dd
                    className={`min-w-0 ${c.mono ? "whitespace-nowrap font-mono" : "break-words"}`}
                  >
                    {c.cell(inv)}
                  </dd>
                </div>
              ))}
            </dl>
          </li>
        ))}
        {invoices.length === 0 ? (
          <li className="panel p-4 text-sm text-graphite-600">No invoices to show.</li>
        ) : null}
      </ul>
      <div className="panel hidden overflow-x-auto sm:block">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            <tr>
              {columns.map((c) => (
                <th
                  key={c.head}
                  className={`px-4 py-2 font-semibold ${c.right ? "text-right" : ""}`}
                >
                  {c.head}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {invoices.map((inv) => (
              <tr
                key={inv.id}
                className="border-b border-graphite-100 last:border-0"
                data-testid={`invoice-row-${inv.id}`}
              >
                {columns.map((c) => (
                  <td
                    key={c.head}
                    className={`px-4 py-2 ${c.mono ? "whitespace-nowrap font-mono" : ""} ${c.right ? "text-right" : ""}`}
                  >
                    {c.cell(inv)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {invoices.length === 0 ? (
          <p className="p-4 text-sm text-graphite-600">No invoices to show.</p>
        ) : null}
      </div>
      <Pager
        page={query.page}
        pageSize={query.pageSize}
        total={total}
        params={{ status: query.status }}
      />
    </section>
  );
}
