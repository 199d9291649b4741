"use client";

import { formatMass } from "@/lib/balance";
import type { Workshop } from "@/lib/workshop/load";
import { useWorkshop } from "./use-workshop";

/** The figure for each crankpin, big enough to read from the balancer, and how it is made up. */
export function Bobweights({ jobId, initial }: { jobId: number; initial: Workshop }) {
  const { data } = useWorkshop(jobId, initial);
  const { plan, job } = data ?? initial;
  const unit = job.spec.massUnit;
  const fmt = (v: string) => formatMass(v, job.spec.scaleResolution);
  const result = plan.finished;
  if (!plan.complete || !result) {
    return (
      <p className="panel p-4 text-graphite-700">
        The bobweights are worked out once every part is weighed.
      </p>
    );
  }
  return (
    <div className="space-y-6">
      {result.bobweightNeeded ? (
        <>
          <section aria-labelledby="bob-title">
            <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
              <h2 id="bob-title" className="text-xl font-semibold">
                Bobweight per crankpin
              </h2>
              <a
                href={`/jobs/${jobId}/bobweights/tag`}
                className="btn-secondary"
                target="_blank"
                rel="noopener"
              >
                Print tag for the balancer
              </a>
            </div>
            <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4" data-testid="bobweights">
              {result.bobweights.map((b) => (
                <li key={b.crankpin} className="panel p-4">
                  <p className="text-sm text-graphite-500">
                    Crankpin {b.crankpin} · cylinders {b.cylinders.join(" & ")}
                  </p>
                  <p className="mt-1 font-mono text-5xl font-semibold tracking-tight">
                    {fmt(b.mass)}
                    <span className="ml-1 text-2xl text-graphite-500">{unit}</span>
                  </p>
                  <p className="mt-2 text-xs text-graphite-600">
                    {fmt(b.rotating)} rotating + {result.balanceFactor} % × {fmt(b.reciprocating)}{" "}
                    reciprocating
                  </p>
                </li>
              ))}
            </ul>
          </section>
          <p className="text-sm text-graphite-600">
            Balance factor {result.balanceFactor} %, oil allowance {result.oilAllowance} {unit} per
            crankpin. From the finished weights
            {plan.reweighed > 0
              ? ` (${plan.reweighed} parts re-weighed after machining)`
              : " as planned (nothing re-weighed yet)"}
            . The engine maker&apos;s figure for the balance factor wins over any default.
          </p>
        </>
      ) : (
        <section className="panel border-l-4 border-l-within p-5" data-testid="no-bobweight">
          <h2 className="text-2xl font-semibold">No bobweight needed</h2>
          <p className="mt-1 text-graphite-700">
            This layout is balanced without bobweights: the throws cancel each other&apos;s primary
            forces. Spin the crank bare; the parts are still matched.
          </p>
        </section>
      )}

      <section className="panel overflow-x-auto p-4">
        <h2 className="mb-2 font-semibold">Per cylinder (finished weights)</h2>
        <table className="w-full text-sm">
          <thead className="text-left text-graphite-500">
            <tr>
              <th className="py-1 pr-4 font-semibold">Cyl.</th>
              <th className="py-1 pr-4 font-semibold">Crankpin</th>
              <th className="py-1 pr-4 font-semibold">Rotating ({unit})</th>
              <th className="py-1 font-semibold">Reciprocating ({unit})</th>
            </tr>
          </thead>
          <tbody className="font-mono">
            {result.cylinders.map((c) => (
              <tr key={c.number} className="border-t border-graphite-100">
                <td className="py-1.5 pr-4">{c.number}</td>
                <td className="py-1.5 pr-4">{c.crankpin}</td>
                <td className="py-1.5 pr-4">{fmt(c.rotating)}</td>
                <td className="py-1.5">{fmt(c.reciprocating)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <p className="text-xs text-graphite-500">
        Figures support, not replace, the machinist&apos;s judgement. Follow the engine maker&apos;s
        figures and the balancing machine&apos;s instructions.
      </p>
    </div>
  );
}
