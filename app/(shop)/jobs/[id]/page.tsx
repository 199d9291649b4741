import { CustomerJob } from "@/components/customer/customer-job";
import { BuildRequests } from "@/components/build/build-requests";
import { BROUGHT_ITEM_LABEL } from "@/components/jobs/brought-items";
import { JobChanges } from "@/components/jobs/job-changes";
import { JobSettingsForm, JobStateControl } from "@/components/jobs/job-settings-form";
import { JobUploads } from "@/components/uploads/job-uploads";
import { JobCards } from "@/components/cards/job-cards";
import { listJobChangesPage } from "@/db/audit";
import { listBuildRequests } from "@/db/build-record";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { isCustomer } from "@/lib/auth/policy";
import { findLayoutPreset } from "@/lib/balance";
import { showLength } from "@/lib/jobs/lengths";
import { loadJobBilling } from "@/lib/billing/job-billing";
import { customerWorkDone } from "@/lib/jobs/customer-summary";
import { loadPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export default async function JobOverviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job, user } = await loadPageJob(id, `/jobs/${id}`);
  if (isCustomer(user)) {
    // The customer's own page: state, what was done, cards, quote and invoice; no bench screens.
    const [workshop, billing] = await Promise.all([
      loadWorkshop(getDb(), job),
      loadJobBilling(getDb(), job.id, user),
    ]);
    return (
      <CustomerJob
        job={job}
        workDone={customerWorkDone(workshop)}
        billing={billing}
        promised={job.spec.promisedDate}
        cards={<JobCards jobId={job.id} user={user} />}
      />
    );
  }
  const shop = true;
  const { changes, earlier } = await listJobChangesPage(getDb(), job.id);
  const [requests, { timeZone }] = await Promise.all([
    listBuildRequests(getDb(), job.id),
    findCounterSettings(getDb()),
  ]);
  const preset = job.spec.layout ? findLayoutPreset(job.spec.layout) : undefined;
  const s = job.spec;
  return (
    <div className="space-y-6">
      {shop ? <JobStateControl job={job} /> : null}
      <BuildRequests jobId={job.id} role={user.role} initial={requests} />
      <div className="grid gap-4 lg:grid-cols-3">
        <section className="panel p-4">
          <h2 className="mb-2 font-semibold">Engine</h2>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-graphite-500">Layout</dt>
            <dd>{preset?.label ?? "not set"}</dd>
            <dt className="text-graphite-500">Cylinders</dt>
            <dd>{s.cylinders ?? "—"}</dd>
            <dt className="text-graphite-500">Bore × stroke</dt>
            <dd className="font-mono">
              {showLength(s, "bore") ?? "—"} × {showLength(s, "stroke") ?? "—"}
            </dd>
            <dt className="text-graphite-500">Rod length</dt>
            <dd className="font-mono">{showLength(s, "rodLength") ?? "—"}</dd>
            <dt className="text-graphite-500">Max rpm</dt>
            <dd className="font-mono">{s.maxRpm ?? "—"}</dd>
            <dt className="text-graphite-500">Promised</dt>
            <dd>{s.promisedDate ?? "—"}</dd>
          </dl>
        </section>
        <section className="panel p-4">
          <h2 className="mb-2 font-semibold">Brought in</h2>
          {s.items.length === 0 ? (
            <p className="text-sm text-graphite-500">Nothing listed.</p>
          ) : (
            <ul className="text-sm">
              {s.items.map((i) => (
                <li key={i.item}>
                  {i.quantity} × {BROUGHT_ITEM_LABEL[i.item]}
                  {i.condition ? <span className="text-graphite-500"> — {i.condition}</span> : null}
                </li>
              ))}
            </ul>
          )}
          {s.condition ? <p className="mt-2 text-sm">{s.condition}</p> : null}
        </section>
        <section className="panel p-4">
          <h2 className="mb-2 font-semibold">Work asked for</h2>
          <p className="text-sm whitespace-pre-line">{job.notes ?? "—"}</p>
        </section>
      </div>
      <JobCards jobId={job.id} user={user} />
      <JobUploads jobId={job.id} user={user} />
      {shop ? <JobSettingsForm job={job} role={user.role} /> : null}
      <p className="rounded border border-brass-300 bg-brass-50 p-3 text-sm text-brass-700">
        A rotating assembly that fails at speed can kill. Follow the engine maker&apos;s figures,
        the balancing machine&apos;s instructions and local codes and licensed practice; wear eye
        protection when machining.
      </p>
      <JobChanges
        jobId={job.id}
        changes={changes}
        earlier={earlier}
        unit={job.spec.massUnit}
        timeZone={timeZone}
      />
    </div>
  );
}
