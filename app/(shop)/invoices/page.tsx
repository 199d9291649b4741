import Link from "next/link";
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
      <div className="panel overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            <tr>
              <th className="px-4 py-2 font-semibold">Invoice</th>
              <th className="px-4 py-2 font-semibold">Job</th>
              {customerId === undefined ? (
                <th className="px-4 py-2 font-semibold">Customer</th>
              ) : null}
              <th className="px-4 py-2 font-semibold">Issued</th>
              <th className="px-4 py-2 text-right font-semibold">Total</th>
              <th className="px-4 py-2 text-right font-semibold">Still owed</th>
              <th className="px-4 py-2 font-semibold">State</th>
            </tr>
          </thead>
          <tbody>
            {invoices.map((inv) => (
              <tr
                key={inv.id}
                className="border-b border-graphite-100 last:border-0"
                data-testid={`invoice-row-${inv.id}`}
              >
                <td className="px-4 py-2 font-mono">
                  <Link
                    href={`/jobs/${inv.jobId}/billing`}
                    className="underline decoration-graphite-300 underline-offset-4 hover:decoration-brass-500"
                  >
                    {inv.number ?? `Draft ${inv.id}`}
                  </Link>
                </td>
                <td className="px-4 py-2 font-mono">{inv.jobNumber}</td>
                {customerId === undefined ? (
                  <td className="px-4 py-2">{inv.customerName}</td>
                ) : null}
                <td className="px-4 py-2 font-mono">
                  {inv.issuedAt ? shopDate(new Date(inv.issuedAt), timeZone) : "—"}
                </td>
                <td className="px-4 py-2 text-right font-mono">
                  {formatMoney(inv.total, inv.currency)}
                </td>
                <td className="px-4 py-2 text-right font-mono">
                  {inv.status === "issued"
                    ? formatMoney(subtractMoney(inv.total, inv.amountPaid), inv.currency)
                    : "—"}
                </td>
                <td className="px-4 py-2">
                  <BillingStatus kind="invoice" status={inv.status} />
                </td>
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
