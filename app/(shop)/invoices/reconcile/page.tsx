import Link from "next/link";
import { UnappliedPaymentsList } from "@/components/payments/unapplied-payments-list";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { requirePagePermission } from "@/lib/auth/guard";
import { listPaymentsToReconcile } from "@/lib/payments/reconcile";
import { unappliedListQuerySchema } from "@/lib/payments/schemas";

export const metadata = { title: "Online payments to reconcile" };

const FILTERS = [
  ["open", "To reconcile"],
  ["applied", "Applied"],
  ["refunded", "Refunded"],
  ["all", "All"],
] as const;

export default async function ReconcilePage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  await requirePagePermission("record-payment", "/invoices/reconcile");
  const parsed = unappliedListQuerySchema.safeParse(await searchParams);
  const query = parsed.success ? parsed.data : unappliedListQuerySchema.parse({});
  const [items, { timeZone }] = await Promise.all([
    listPaymentsToReconcile(getDb(), query),
    findCounterSettings(getDb()),
  ]);
  return (
    <section className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-sm">
            <Link href="/invoices" className="underline underline-offset-4">
              Invoices
            </Link>
          </p>
          <h1 className="text-2xl font-semibold">Online payments to reconcile</h1>
        </div>
        <nav aria-label="Which payments" className="flex gap-3 text-sm">
          {FILTERS.map(([value, label]) => (
            <Link
              key={value}
              href={`/invoices/reconcile?status=${value}`}
              aria-current={query.status === value ? "page" : undefined}
              className={
                query.status === value
                  ? "font-semibold underline underline-offset-4"
                  : "underline decoration-graphite-300 underline-offset-4"
              }
            >
              {label}
            </Link>
          ))}
        </nav>
      </div>
      <p className="max-w-3xl text-sm text-graphite-700">
        Money the payment service took that is on no invoice: a second payment for an invoice
        already paid, more than was owed, a payment for a void invoice or from a payment page that
        had been closed. Apply it where it fits what is owed; otherwise refund it at the payment
        service first, then mark it refunded here with the refund&apos;s reference.
      </p>
      <UnappliedPaymentsList items={items} timeZone={timeZone} />
    </section>
  );
}
