import { RemovalPlan } from "@/components/workshop/removal-plan";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { may } from "@/lib/auth/policy";
import { loadBenchPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Metal to remove" };

export default async function PlanPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job, user } = await loadBenchPageJob(id, `/jobs/${id}/plan`);
  const [workshop, { timeZone }] = await Promise.all([
    loadWorkshop(getDb(), job),
    findCounterSettings(getDb()),
  ]);
  return (
    <RemovalPlan
      jobId={job.id}
      initial={workshop}
      canEdit={may(user, "weigh")}
      timeZone={timeZone}
    />
  );
}
