import Link from "next/link";
import { StatusBadge } from "@/components/jobs/status-badge";
import { STATUS_LABEL } from "@/components/jobs/status";
import { Pager } from "@/components/ui/pager";
import { getDb } from "@/db/client";
import { listJobs } from "@/db/jobs";
import { JOB_STATUSES } from "@/db/schema";
import { ALL_ROLES, requirePageUser } from "@/lib/auth/guard";
import { customerScope } from "@/lib/jobs/access";
import { jobListQuerySchema } from "@/lib/validation/jobs";

export const metadata = { title: "Jobs" };

export default async function JobsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const user = await requirePageUser(ALL_ROLES, "/jobs");
  const raw = await searchParams;
  const parsed = jobListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : jobListQuerySchema.parse({});
  const { jobs, total } = await listJobs(getDb(), {
    customerId: customerScope(user) ?? query.customerId,
    status: query.status,
    search: query.search,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });

  return (
    <section>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-4">
        <h1 className="text-2xl font-semibold">
          {user.role === "customer" ? "Your jobs" : "Jobs"}
        </h1>
        <form className="flex flex-wrap items-end gap-2" role="search">
          <label className="text-sm">
            <span className="mb-1 block font-semibold">Find</span>
            <input
              name="search"
              defaultValue={query.search ?? ""}
              placeholder="Number, engine, customer"
              className="field-input w-64"
            />
          </label>
          <label className="text-sm">
            <span className="mb-1 block font-semibold">State</span>
            <select name="status" defaultValue={query.status ?? ""} className="field-input w-48">
              <option value="">Any</option>
              {JOB_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {STATUS_LABEL[s]}
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
              <th className="px-4 py-2 font-semibold">Job</th>
              <th className="px-4 py-2 font-semibold">Customer</th>
              <th className="px-4 py-2 font-semibold">Engine</th>
              <th className="px-4 py-2 font-semibold">State</th>
              <th className="px-4 py-2 font-semibold">Updated</th>
            </tr>
          </thead>
          <tbody>
            {jobs.map((job) => (
              <tr key={job.id} className="border-b border-graphite-100 last:border-0">
                <td className="px-4 py-2 font-mono">
                  <Link
                    href={`/jobs/${job.id}`}
                    className="underline decoration-graphite-300 underline-offset-4 hover:decoration-brass-500"
                  >
                    {job.number}
                  </Link>
                </td>
                <td className="px-4 py-2">{job.customerName}</td>
                <td className="px-4 py-2">{job.engine}</td>
                <td className="px-4 py-2">
                  <StatusBadge status={job.status} />
                </td>
                <td className="px-4 py-2 text-graphite-500">{job.updatedAt.slice(0, 10)}</td>
              </tr>
            ))}
            {jobs.length === 0 ? (
              <tr>
                <td colSpan={5} className="px-4 py-8 text-center text-graphite-500">
                  No jobs match.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <Pager page={query.page} pageSize={query.pageSize} total={total} params={raw} />
    </section>
  );
}
