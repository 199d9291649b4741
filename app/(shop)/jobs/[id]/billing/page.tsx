import Link from "next/link";
import { notFound } from "next/navigation";
import { JobBillingPanel } from "@/components/billing/job-billing-panel";
import { getDb } from "@/db/client";
import { requirePagePermission } from "@/lib/auth/guard";
import { loadJobBilling } from "@/lib/billing/job-billing";
import { HttpError } from "@/lib/http/errors";

export const metadata = { title: "Quote & invoice" };

export default async function JobBillingPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePagePermission("read-billing", `/jobs/${id}/billing`);
  const jobId = Number(id);
  if (!/^\d{1,12}$/.test(id) || !Number.isSafeInteger(jobId) || jobId < 1) notFound();
  const billing = await loadJobBilling(getDb(), jobId, user).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  return (
    <article className="space-y-6">
      <header className="flex flex-wrap items-baseline gap-4">
        {/* The job's layout holds the page's one level-1 heading (the job number). */}
        <h2 className="text-xl font-semibold">
          Quote & invoice · <span className="font-mono">{billing.job.number}</span>
        </h2>
        <p className="text-graphite-600">
          {billing.job.customerName} · {billing.job.engine}
        </p>
        <Link href={`/jobs/${billing.job.id}`} className="text-sm underline underline-offset-4">
          Back to the job
        </Link>
      </header>
      <JobBillingPanel initial={billing} />
    </article>
  );
}
