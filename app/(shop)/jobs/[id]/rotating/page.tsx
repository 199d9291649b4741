import { RotatingParts } from "@/components/workshop/rotating-parts";
import { getDb } from "@/db/client";
import { may } from "@/lib/auth/policy";
import { loadBenchPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Crank & rotating parts" };

export default async function RotatingPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job, user } = await loadBenchPageJob(id, `/jobs/${id}/rotating`);
  return (
    <RotatingParts
      jobId={job.id}
      initial={await loadWorkshop(getDb(), job)}
      canEdit={may(user, "weigh")}
    />
  );
}
