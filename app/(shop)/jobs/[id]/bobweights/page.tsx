import { Bobweights } from "@/components/workshop/bobweights";
import { getDb } from "@/db/client";
import { loadBenchPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Bobweights" };

export default async function BobweightsPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job } = await loadBenchPageJob(id, `/jobs/${id}/bobweights`);
  return <Bobweights jobId={job.id} initial={await loadWorkshop(getDb(), job)} />;
}
