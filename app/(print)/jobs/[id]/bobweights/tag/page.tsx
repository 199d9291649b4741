import { PrintButton } from "@/components/ui/print-button";
import { getDb } from "@/db/client";
import { formatMass } from "@/lib/balance";
import { loadPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Bobweight tag" };
export const dynamic = "force-dynamic";

/** A tag that goes with the bobweights to the balancer: job, engine and the figure per crankpin. */
export default async function BobweightTagPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job } = await loadPageJob(id, `/jobs/${id}/bobweights/tag`);
  const { plan } = await loadWorkshop(getDb(), job);
  const result = plan.finished;
  const unit = job.spec.massUnit;
  return (
    <main className="mx-auto max-w-md p-6 print:p-0">
      <div
        className="rounded-lg border-2 border-dashed border-graphite-800 p-5"
        data-testid="bobweight-tag"
      >
        <p className="font-mono text-xs tracking-[0.3em] uppercase">Bobweight tag</p>
        <p className="mt-1 font-mono text-2xl font-semibold">{job.number}</p>
        <p className="text-sm">
          {job.customerName} · {job.engine}
        </p>
        {!result ? (
          <p className="mt-4">Weigh-in not complete: no figures yet.</p>
        ) : !result.bobweightNeeded ? (
          <p className="mt-4 text-xl font-semibold">No bobweight needed</p>
        ) : (
          <table className="mt-4 w-full">
            <tbody>
              {result.bobweights.map((b) => (
                <tr key={b.crankpin} className="border-t border-graphite-300">
                  <td className="py-2 text-sm">
                    Pin {b.crankpin}{" "}
                    <span className="text-graphite-500">(cyl. {b.cylinders.join(", ")})</span>
                  </td>
                  <td className="py-2 text-right font-mono text-3xl font-semibold">
                    {formatMass(b.mass, job.spec.scaleResolution)} {unit}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {result?.bobweightNeeded ? (
          <p className="mt-3 text-xs">
            Factor {result.balanceFactor} % · oil {result.oilAllowance} {unit}/pin · printed{" "}
            {new Date().toISOString().slice(0, 10)}
          </p>
        ) : null}
      </div>
      <PrintButton />
    </main>
  );
}
