import Link from "next/link";
import { JobsTable } from "@/components/jobs/jobs-table";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { listJobs } from "@/db/jobs";
import { requirePagePermission } from "@/lib/auth/guard";
import { isCustomer, may } from "@/lib/auth/policy";
import { customerScope } from "@/lib/jobs/access";

export const metadata = { title: "Jobs" };

const PAGE_SIZE = 25;

export default async function JobsPage() {
  const user = await requirePagePermission("list-jobs", "/jobs");
  const [{ jobs, total }, { timeZone }] = await Promise.all([
    listJobs(getDb(), { customerId: customerScope(user), limit: PAGE_SIZE }),
    findCounterSettings(getDb()),
  ]);
  return (
    <section>
      <div className="mb-4 flex flex-wrap items-center justify-between gap-4">
        <h1 className="text-2xl font-semibold">{isCustomer(user) ? "Your jobs" : "Jobs"}</h1>
        {may(user, "book-job") ? (
          <Link href="/jobs/new" className="btn-primary">
            Book a job in
          </Link>
        ) : null}
      </div>
      <JobsTable
        initial={{ jobs, total, page: 1, pageSize: PAGE_SIZE }}
        customerView={isCustomer(user)}
        timeZone={timeZone}
      />
    </section>
  );
}
