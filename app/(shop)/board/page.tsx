import Link from "next/link";
import { STATUS_LABEL } from "@/components/jobs/status";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { type Job, listJobs } from "@/db/jobs";
import type { JobStatus } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/guard";
import { readyFirstOnBoard } from "@/lib/auth/policy";
import { shopToday } from "@/lib/dates/shop-time";

export const metadata = { title: "Bench board" };

const BENCH: JobStatus[] = ["booked", "weighing", "machining", "balancing", "checking"];

function JobCard({ job, today }: { job: Job; today: string }) {
  const due = job.spec.promisedDate;
  const late = due !== null && due < today;
  return (
    <li>
      <Link
        href={`/jobs/${job.id}`}
        className="block rounded border border-graphite-200 bg-white p-3 hover:border-brass-500"
      >
        <span className="font-mono font-semibold">{job.number}</span>
        <span className="block text-sm">{job.customerName}</span>
        <span className="block truncate text-xs text-graphite-500">{job.engine}</span>
        {due ? (
          <span
            className={`mt-1 block text-xs ${late ? "font-semibold text-replace" : "text-graphite-600"}`}
          >
            {late ? "Overdue: " : due === today ? "Due today: " : "Promised "}
            {due}
          </span>
        ) : null}
      </Link>
    </li>
  );
}

/** Today's work on the bench by where each job stands, and what waits at the counter for collection. */
export default async function BoardPage() {
  const user = await requirePagePermission("see-board", "/board");
  const db = getDb();
  // "Today" and "overdue" on the shop's calendar, in its own time zone (not UTC's).
  const today = shopToday((await findCounterSettings(db)).timeZone);
  const [bench, ready] = await Promise.all([
    listJobs(db, { statuses: BENCH, sort: "promised", limit: 200 }),
    listJobs(db, { status: "ready", sort: "promised", limit: 100 }),
  ]);
  const byStatus = (s: JobStatus) => bench.jobs.filter((j) => j.status === s);
  const readySection = (
    <section aria-labelledby="ready-title" className="panel p-4">
      <h2 id="ready-title" className="mb-2 text-lg font-semibold">
        Ready to collect ({ready.total})
      </h2>
      {ready.jobs.length === 0 ? (
        <p className="text-sm text-graphite-500">Nothing waiting.</p>
      ) : (
        <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-4">
          {ready.jobs.map((j) => (
            <JobCard key={j.id} job={j} today={today} />
          ))}
        </ul>
      )}
    </section>
  );
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold">Bench board</h1>
      {readyFirstOnBoard(user) ? readySection : null}
      <section aria-label="On the bench" className="grid gap-4 md:grid-cols-3 xl:grid-cols-5">
        {BENCH.map((s) => (
          <div key={s} className="rounded-md bg-graphite-100 p-3">
            <h2 className="mb-2 text-sm font-semibold text-graphite-700">
              {STATUS_LABEL[s]} <span className="text-graphite-500">({byStatus(s).length})</span>
            </h2>
            <ul className="space-y-2">
              {byStatus(s).map((j) => (
                <JobCard key={j.id} job={j} today={today} />
              ))}
            </ul>
          </div>
        ))}
      </section>
      {!readyFirstOnBoard(user) ? readySection : null}
    </div>
  );
}
