import Link from "next/link";
import { notFound } from "next/navigation";
import { CustomerHistory } from "@/components/customers/customer-history";
import { EditCustomerForm } from "@/components/customers/edit-customer-form";
import { MergeCustomerForm } from "@/components/customers/merge-customer-form";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { findCustomerById, listCustomerHistory } from "@/db/customers";
import { listJobs } from "@/db/jobs";
import { requirePagePermission } from "@/lib/auth/guard";
import { may } from "@/lib/auth/policy";

export const metadata = { title: "Customer" };

export default async function CustomerPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { id } = await params;
  const user = await requirePagePermission("read-customers", `/customers/${id}`);
  const customerId = Number(id);
  if (!/^\d{1,12}$/.test(id) || !Number.isSafeInteger(customerId) || customerId < 1) notFound();
  const db = getDb();
  const customer = await findCustomerById(db, customerId);
  if (!customer) notFound();
  const canEdit = may(user, "manage-customers");
  const [{ jobs, total }, history, { timeZone }, { merged }] = await Promise.all([
    listJobs(db, { customerId, limit: 50 }),
    listCustomerHistory(db, customerId),
    findCounterSettings(db),
    searchParams,
  ]);

  return (
    <section className="space-y-4">
      <p className="text-sm">
        <Link href="/customers" className="underline">
          Customers
        </Link>
      </p>
      <h1 className="text-2xl font-semibold break-words">{customer.name}</h1>
      {merged ? (
        <p role="status" className="text-sm text-within">
          Customers merged; everything now belongs to {customer.name}.
        </p>
      ) : null}
      {canEdit ? (
        <EditCustomerForm key={customer.id} customer={customer} />
      ) : (
        <dl className="panel grid gap-2 p-4 text-sm sm:grid-cols-2">
          {(
            [
              ["Company", customer.company],
              ["E-mail", customer.email],
              ["Phone", customer.phone],
              ["Address", customer.address],
            ] as const
          ).map(([label, value]) => (
            <div key={label}>
              <dt className="font-semibold">{label}</dt>
              <dd className="break-words">{value ?? "—"}</dd>
            </div>
          ))}
        </dl>
      )}
      <section className="panel p-4" aria-labelledby="customer-jobs-title">
        <h2 id="customer-jobs-title" className="mb-2 font-semibold">
          Jobs ({total})
        </h2>
        {jobs.length === 0 ? (
          <p className="text-sm text-graphite-500">No jobs yet.</p>
        ) : (
          <ul className="space-y-1 text-sm" data-testid="customer-jobs">
            {jobs.map((j) => (
              <li key={j.id}>
                <Link href={`/jobs/${j.id}`} className="font-mono underline">
                  {j.number}
                </Link>{" "}
                {j.engine}
              </li>
            ))}
          </ul>
        )}
      </section>
      {canEdit ? <MergeCustomerForm keepId={customer.id} keepName={customer.name} /> : null}
      <CustomerHistory changes={history} timeZone={timeZone} />
    </section>
  );
}
