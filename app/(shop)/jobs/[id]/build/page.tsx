import { BuildCards } from "@/components/build/build-cards";
import { BuildRecordScreen } from "@/components/build/build-record-screen";
import { listBuildCards } from "@/db/build-record";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { may } from "@/lib/auth/policy";
import { loadBuildRecord, recordShownTo } from "@/lib/build-record/record";
import { loadPageJob } from "@/lib/jobs/page-job";

export const metadata = { title: "Engine build record" };

export default async function BuildRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job, user } = await loadPageJob(id, `/jobs/${id}/build`);
  if (!recordShownTo(job, user)) {
    return (
      <p className="text-sm text-graphite-600">
        The engine build record is shown here once the job is ready to collect.
      </p>
    );
  }
  const record = await loadBuildRecord(getDb(), job, user);
  const s = job.spec;
  const jobUnit = s.lengthUnit === "in" ? ("in" as const) : ("mm" as const);
  const jobBore = s.boreEntered !== null ? { value: s.boreEntered, unit: jobUnit } : null;
  const jobStroke = s.strokeEntered !== null ? { value: s.strokeEntered, unit: jobUnit } : null;
  const [cards, { timeZone }] = await Promise.all([
    listBuildCards(getDb(), job.id),
    findCounterSettings(getDb()),
  ]);
  return (
    <div className="space-y-6">
      <BuildCards jobId={job.id} role={user.role} initial={cards} timeZone={timeZone} />
      <BuildRecordScreen
        initial={record}
        cylinders={s.cylinders ?? 8}
        readOnly={!may(user, "edit-build-record")}
        jobBore={jobBore}
        jobStroke={jobStroke}
      />
    </div>
  );
}
