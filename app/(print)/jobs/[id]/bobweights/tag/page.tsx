import { oilAllowanceLine, pinList, rodsWord } from "@/components/workshop/bobweight-text";
import { PrintButton } from "@/components/ui/print-button";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { formatDerivedMass, formatMass } from "@/lib/balance";
import { shopToday } from "@/lib/dates/shop-time";
import { loadPageJob } from "@/lib/jobs/page-job";
import { loadWorkshop } from "@/lib/workshop/load";

export const metadata = { title: "Bobweight tag" };
export const dynamic = "force-dynamic";

/**
 * A tag that goes with the bobweights to the balancer: job, engine, the figure to build the
 * bobweights to, and each crankpin's own figure.
 */
export default async function BobweightTagPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { job } = await loadPageJob(id, `/jobs/${id}/bobweights/tag`);
  const [{ plan }, { timeZone }] = await Promise.all([
    loadWorkshop(getDb(), job),
    findCounterSettings(getDb()),
  ]);
  const result = plan.finished;
  const unit = job.spec.massUnit;
  const resolution = job.spec.scaleResolution;
  const show = (v: string) => formatDerivedMass(v, resolution);
  const oil = result ? oilAllowanceLine(result, show, unit) : null;
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
          result.buildTo.map((set) => (
            <div key={set.rodsPerPin} className="mt-4 border-t-2 border-graphite-800 pt-3">
              <p className="text-sm">
                Build to ({pinList(set.pins)}, {rodsWord(set.rodsPerPin)} each)
              </p>
              <p className="font-mono text-4xl font-semibold" data-testid="tag-build-to">
                {show(set.mass)} {unit}
              </p>
              <table className="mt-2 w-full text-sm">
                <tbody>
                  {set.pins.map((p) => (
                    <tr key={p.crankpin} className="border-t border-graphite-300">
                      <td className="py-1">Pin {p.crankpin}</td>
                      <td className="py-1 text-right font-mono">
                        {show(p.mass)} {unit}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {set.pins.length > 1 ? (
                <p className="mt-1 text-xs">
                  Spread {show(set.spread)} {unit}
                  {set.spreadAboveResolution
                    ? `: more than the scale resolution (${formatMass(resolution, resolution)} ${unit}); check the parts before building.`
                    : "."}
                </p>
              ) : null}
            </div>
          ))
        )}
        {result?.bobweightNeeded ? (
          <p className="mt-3 text-xs">
            Factor {result.balanceFactor} % ·{" "}
            {oil?.none ? <strong>no oil allowance included</strong> : oil?.text} · printed{" "}
            {shopToday(timeZone)}
          </p>
        ) : null}
      </div>
      <PrintButton />
    </main>
  );
}
