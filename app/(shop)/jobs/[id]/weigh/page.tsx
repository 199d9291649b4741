import { WeighBench } from "@/components/workshop/weigh-bench";
import { getDb } from "@/db/client";
import { may } from "@/lib/auth/policy";
import { loadBenchPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Scale" };

export default async function WeighPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job, user } = await loadBenchPageJob(id, `/jobs/${id}/weigh`);
  if (!job.spec.layout || !job.spec.cylinders) {
    return (
      <p className="text-graphite-600">
        Set the engine layout and cylinders on the overview before weighing.
      </p>
    );
  }
  const workshop = await loadWorkshop(getDb(), job);
  return <WeighBench jobId={job.id} initial={workshop} canEdit={may(user, "weigh")} />;
}
