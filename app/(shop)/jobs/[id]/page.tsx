import { notFound } from "next/navigation";
import { StatusBadge } from "@/components/jobs/status-badge";
import { listAuditEntries } from "@/db/audit";
import { getDb } from "@/db/client";
import { ALL_ROLES, requirePageUser } from "@/lib/auth/guard";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";

export default async function JobPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser(ALL_ROLES, `/jobs/${id}`);
  const jobId = Number(id);
  if (!Number.isSafeInteger(jobId) || jobId < 1) notFound();
  const job = await findJobForUser(getDb(), jobId, user).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const history = user.role === "customer" ? [] : await listAuditEntries(getDb(), "job", job.id);

  return (
    <article className="space-y-6">
      <header className="flex flex-wrap items-baseline gap-4">
        <h1 className="font-mono text-2xl font-semibold">{job.number}</h1>
        <StatusBadge status={job.status} />
        <p className="text-graphite-600">
          {job.customerName} · {job.engine}
        </p>
      </header>
      {job.notes ? (
        <section className="panel p-4">
          <h2 className="mb-1 text-sm font-semibold text-graphite-600">Work asked for</h2>
          <p className="whitespace-pre-line">{job.notes}</p>
        </section>
      ) : null}
      {history.length > 0 ? (
        <section className="panel p-4">
          <h2 className="mb-2 text-sm font-semibold text-graphite-600">History</h2>
          <ol className="space-y-1 text-sm">
            {history.map((h) => (
              <li key={h.id}>
                <span className="font-mono text-graphite-500">
                  {h.at.slice(0, 16).replace("T", " ")}
                </span>{" "}
                {h.action}
              </li>
            ))}
          </ol>
        </section>
      ) : null}
    </article>
  );
}
