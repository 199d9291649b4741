import type { ReactNode } from "react";
import { JobTabs } from "@/components/jobs/job-tabs";
import { StatusBadge } from "@/components/jobs/status-badge";
import { loadPageJob } from "@/lib/jobs/page-job";

export default async function JobLayout({
  children,
  params,
}: {
  children: ReactNode;
  params: Promise<{ id: string }>;
}) {
  const { id } = await params;
  const { job, user } = await loadPageJob(id, `/jobs/${id}`);
  return (
    <div>
      <header className="mb-4 flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h1 className="font-mono text-2xl font-semibold">{job.number}</h1>
        <StatusBadge status={job.status} />
        <p className="text-graphite-600">
          {job.customerName} · {job.engine}
        </p>
      </header>
      <JobTabs jobId={job.id} role={user.role} />
      {children}
    </div>
  );
}
