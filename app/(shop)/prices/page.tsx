import { AddPriceForm, PriceRow } from "@/components/billing/price-forms";
import { getDb } from "@/db/client";
import { listPriceItems } from "@/db/prices";
import { findShopSettings } from "@/db/settings";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "Prices" };

export default async function PricesPage() {
  await requirePagePermission("manage-prices", "/prices");
  const db = getDb();
  const [prices, settings] = await Promise.all([listPriceItems(db), findShopSettings(db)]);
  return (
    <section className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold">Prices</h1>
        <p className="text-sm text-graphite-600">
          Before tax, in {settings.currency}. Quotes and invoices take these prices when a line is
          added; changing a price here leaves lines already quoted or invoiced as they were. Turn an
          entry off rather than reusing its code for different work.
        </p>
      </div>
      <div className="panel relative overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-graphite-200 bg-graphite-50 text-graphite-600">
            <tr>
              <th className="px-3 py-2 font-semibold">Code</th>
              <th className="px-3 py-2 font-semibold">Work</th>
              <th className="px-3 py-2 font-semibold">Kind</th>
              <th className="px-3 py-2 text-right font-semibold">Each</th>
              <th className="px-3 py-2 font-semibold">In use</th>
              <th className="px-3 py-2">
                <span className="sr-only">Save</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {prices.map((p) => (
              <PriceRow key={`${p.id}-${p.version}`} price={p} />
            ))}
          </tbody>
        </table>
        {prices.length === 0 ? (
          <p className="p-4 text-sm text-graphite-600">No prices yet: add the first below.</p>
        ) : null}
      </div>
      <AddPriceForm />
    </section>
  );
}
