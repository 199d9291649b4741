import Link from "next/link";
import { AddCustomerForm } from "@/components/customers/add-customer-form";
import { InviteCustomerButton } from "@/components/mail/invite-customer-button";
import { Pager } from "@/components/ui/pager";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { listCustomers } from "@/db/customers";
import { requirePagePermission } from "@/lib/auth/guard";
import { may } from "@/lib/auth/policy";
import { listQuerySchema } from "@/lib/validation/customers";

export const metadata = { title: "Customers" };

export default async function CustomersPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const user = await requirePagePermission("read-customers", "/customers");
  const raw = await searchParams;
  const parsed = listQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : listQuerySchema.parse({});
  const [{ customers, total }, { timeZone }] = await Promise.all([
    listCustomers(getDb(), {
      search: query.search,
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
    }),
    findCounterSettings(getDb()),
  ]);
  const canAdd = may(user, "manage-customers");

  return (
    <section className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <h1 className="text-2xl font-semibold">Customers</h1>
        <form role="search" className="flex w-full items-end gap-2 sm:w-auto">
          <label className="min-w-0 flex-1 text-sm sm:flex-none">
            <span className="mb-1 block font-semibold">Find</span>
            <input
              name="search"
              defaultValue={query.search ?? ""}
              placeholder="Name, company, e-mail, phone"
              className="field-input w-full sm:w-72"
            />
          </label>
          <button className="btn-secondary" type="submit">
            Show
          </button>
        </form>
      </div>
      <ul className="space-y-2 sm:hidden" data-testid="customer-cards">
        {customers.map((c) => (
          <li key={c.id} className="panel space-y-1 p-3 text-sm">
            <Link href={`/customers/${c.id}`} className="block font-semibold underline">
              {c.name}
            </Link>
            {c.company ? <p>{c.company}</p> : null}
            {c.email ? <p className="break-all">{c.email}</p> : null}
            {c.phone ? <p>{c.phone}</p> : null}
            {canAdd ? (
              <InviteCustomerButton customerId={c.id} email={c.email} timeZone={timeZone} />
            ) : null}
          </li>
        ))}
        {customers.length === 0 ? (
          <li className="panel p-4 text-center text-graphite-500">No customers match.</li>
        ) : null}
      </ul>
      <div className="panel hidden overflow-x-auto sm:block">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            <tr>
              <th className="px-4 py-2 font-semibold">Name</th>
              <th className="px-4 py-2 font-semibold">Company</th>
              <th className="px-4 py-2 font-semibold">E-mail</th>
              <th className="px-4 py-2 font-semibold">Phone</th>
              {canAdd ? <th className="px-4 py-2 font-semibold">Online access</th> : null}
            </tr>
          </thead>
          <tbody>
            {customers.map((c) => (
              <tr key={c.id} className="border-b border-graphite-100 last:border-0">
                <td className="px-4 py-2 font-semibold">
                  <Link href={`/customers/${c.id}`} className="underline">
                    {c.name}
                  </Link>
                </td>
                <td className="px-4 py-2">{c.company}</td>
                <td className="px-4 py-2">{c.email}</td>
                <td className="px-4 py-2">{c.phone}</td>
                {canAdd ? (
                  <td className="px-4 py-2">
                    <InviteCustomerButton customerId={c.id} email={c.email} timeZone={timeZone} />
                  </td>
                ) : null}
              </tr>
            ))}
            {customers.length === 0 ? (
              <tr>
                <td colSpan={canAdd ? 5 : 4} className="px-4 py-8 text-center text-graphite-500">
                  No customers match.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <Pager page={query.page} pageSize={query.pageSize} total={total} params={raw} />
      {canAdd ? <AddCustomerForm /> : null}
    </section>
  );
}
