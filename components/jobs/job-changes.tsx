import type { JobChange } from "@/db/audit";
import { shopDateTime } from "@/lib/dates/shop-time";
import { describeChange } from "./change-sentences";

/**
 * The job's history, newest first, as sentences; saves that changed nothing are left out. Times
 * are on the shop's clock in its time zone (an IANA name).
 */
export function JobChanges({
  changes,
  unit,
  timeZone,
}: {
  changes: JobChange[];
  unit: "g" | "oz";
  timeZone: string;
}) {
  const entries = changes
    .map((c) => ({ ...c, lines: describeChange(c, unit) }))
    .filter((c) => c.lines.length > 0);
  if (entries.length === 0) return null;
  return (
    <section className="panel p-4" aria-labelledby="changes-title">
      <h2 id="changes-title" className="mb-2 text-sm font-semibold text-graphite-600">
        Changes (newest first)
      </h2>
      <ol className="max-h-96 space-y-1 overflow-y-auto text-sm" data-testid="job-changes">
        {entries.map((c) => (
          <li key={c.id} className="grid gap-x-2 sm:grid-cols-[12rem_9rem_1fr]">
            <span className="font-mono text-graphite-500">{shopDateTime(c.at, timeZone)}</span>
            <span className="truncate text-graphite-700">{c.who ?? "system"}</span>
            <span>{c.lines.join("; ")}.</span>
          </li>
        ))}
      </ol>
    </section>
  );
}
