import type { ReactNode } from "react";
import { CardStaleBanner } from "@/components/cards/card-stale-banner";
import { JobTabs } from "@/components/jobs/job-tabs";
import { StatusBadge } from "@/components/jobs/status-badge";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { may } from "@/lib/auth/policy";
import { findCardStatus } from "@/lib/cards/status";
import { env } from "@/lib/env";
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
  // Shop staff see when the job has moved on from its balance card, on every page of the job.
  const [cardStatus, { timeZone }] = await Promise.all([
    !may(user, "read-bench") ? null : findCardStatus(getDb(), job.id, user),
    findCounterSettings(getDb()),
  ]);
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
      {cardStatus ? (
        <CardStaleBanner
          jobId={job.id}
          initial={cardStatus}
          canIssue={may(user, "issue-card")}
          defaultPageSize={env().CARD_PAGE_SIZE}
          timeZone={timeZone}
        />
      ) : null}
      {children}
    </div>
  );
}
