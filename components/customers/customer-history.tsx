import type { CustomerChange } from "@/db/customers";
import { shopDateTime } from "@/lib/dates/shop-time";

const FIELD_WORDS: Record<string, string> = {
  name: "name",
  company: "company",
  email: "e-mail",
  phone: "phone",
  address: "address",
  notes: "notes",
};

function plural(n: number, one: string, many = `${one}s`) {
  return `${n} ${n === 1 ? one : many}`;
}

/** One history entry as a sentence. */
export function describeCustomerChange(change: CustomerChange): string {
  const before = change.before ?? {};
  const after = change.after ?? {};
  switch (change.action) {
    case "create":
      return "Customer added";
    case "update": {
      const changed = Object.keys(FIELD_WORDS).filter(
        (k) => (before[k] ?? null) !== (after[k] ?? null),
      );
      return changed.length
        ? `Changed ${changed.map((k) => FIELD_WORDS[k]).join(", ")}`
        : "Saved with no change";
    }
    case "merge": {
      const moved = (after.moved ?? {}) as Record<string, number>;
      const parts = [
        plural(moved.jobs ?? 0, "job"),
        plural(moved.quotes ?? 0, "quote"),
        plural(moved.invoices ?? 0, "invoice"),
        plural(moved.accounts ?? 0, "online account"),
        plural(moved.invites ?? 0, "invite"),
      ];
      return `Merged in ${String(before.name ?? "a customer")} (no. ${String(after.removedId)}): ${parts.join(", ")} moved here, the duplicate removed`;
    }
    case "merged_away":
      return `Merged into ${String(after.keptName ?? "another customer")} and removed`;
    default:
      return change.action;
  }
}

/** The customer's history, newest first, with times on the shop's clock. */
export function CustomerHistory({
  changes,
  timeZone,
}: {
  changes: CustomerChange[];
  timeZone: string;
}) {
  return (
    <section className="panel p-4" aria-labelledby="customer-history-title">
      <h2 id="customer-history-title" className="mb-2 font-semibold">
        History (newest first)
      </h2>
      {changes.length === 0 ? (
        <p className="text-sm text-graphite-500">Nothing recorded yet.</p>
      ) : (
        <ol className="space-y-2 text-sm" data-testid="customer-history">
          {changes.map((c) => (
            <li key={c.id} className="flex flex-col gap-x-3 sm:flex-row">
              <span className="shrink-0 font-mono text-graphite-500">
                {shopDateTime(c.at, timeZone)}
              </span>
              <span className="shrink-0 text-graphite-700">{c.who ?? "system"}</span>
              <span>{describeCustomerChange(c)}.</span>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
