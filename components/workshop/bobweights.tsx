"use client";

import {
  type BalanceResult,
  type BobweightSet,
  findLayoutPreset,
  formatDerivedMass,
  formatMass,
} from "@/lib/balance";
import type { Workshop } from "@/lib/workshop/load";
import { oilAllowanceLine, pinList, rodsWord } from "./bobweight-text";
import { useWorkshop } from "./use-workshop";

function BuildSet({
  set,
  result,
  show,
  unit,
  resolution,
}: {
  set: BobweightSet;
  result: BalanceResult;
  show: (mass: string) => string;
  unit: string;
  resolution: string;
}) {
  const byPin = new Map(result.bobweights.map((b) => [b.crankpin, b]));
  const several = set.pins.length > 1;
  return (
    <section className="space-y-3" aria-label={`Bobweights for ${pinList(set.pins)}`}>
      <div className="panel border-l-4 border-l-within p-4" data-testid="build-to">
        <p className="text-sm text-graphite-600">
          Build {several ? `one set of ${set.pins.length} bobweights` : "the bobweight"} for{" "}
          {pinList(set.pins)} ({rodsWord(set.rodsPerPin)} on each pin) to
        </p>
        <p className="mt-1 font-mono text-5xl font-semibold tracking-tight">
          {show(set.mass)}
          <span className="ml-1 text-2xl text-graphite-500">{unit}</span>
        </p>
        {several ? (
          <p className="mt-2 text-sm text-graphite-700" data-testid="build-to-spread">
            The mean of the pins below: they range from {show(set.min)} to {show(set.max)} {unit}, a
            spread of {show(set.spread)} {unit}.
          </p>
        ) : null}
        {set.spreadAboveResolution ? (
          <p
            className="mt-2 rounded border border-amber-300 bg-amber-50 p-2 text-sm text-graphite-800"
            role="status"
            data-testid="build-to-warning"
          >
            The pins differ by {show(set.spread)} {unit}, more than the scale resolution (
            {formatMass(resolution, resolution)} {unit}): one set built to {show(set.mass)} {unit}{" "}
            is off on the heaviest and lightest pins by more than the scale can show. Check the
            weights of the parts on crankpins{" "}
            {set.pins.find((p) => p.mass === set.max)?.crankpin ?? "?"} and{" "}
            {set.pins.find((p) => p.mass === set.min)?.crankpin ?? "?"} before building.
          </p>
        ) : null}
      </div>
      <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4" data-testid="bobweights">
        {set.pins.map((p) => {
          const b = byPin.get(p.crankpin);
          return (
            <li key={p.crankpin} className="panel p-3">
              <p className="text-sm text-graphite-500">
                Crankpin {p.crankpin}
                {b ? ` · cylinders ${b.cylinders.join(" & ")}` : ""}
              </p>
              <p className="mt-1 font-mono text-2xl font-semibold">
                {show(p.mass)}
                <span className="ml-1 text-base text-graphite-500">{unit}</span>
              </p>
              {b ? (
                <p className="mt-1 text-xs text-graphite-600">
                  {show(b.rotating)} rotating (oil {show(b.oil)} included) + {result.balanceFactor}{" "}
                  % × {show(b.reciprocating)} reciprocating
                </p>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}

/** The figure to build the bobweights to, each crankpin's own figure, and how they are made up. */
export function Bobweights({ jobId, initial }: { jobId: number; initial: Workshop }) {
  const { data } = useWorkshop(jobId, initial);
  const { plan, job } = data ?? initial;
  const unit = job.spec.massUnit;
  const resolution = job.spec.scaleResolution;
  const show = (v: string) => formatDerivedMass(v, resolution);
  const result = plan.finished;
  if (!plan.complete || !result) {
    return (
      <p className="panel p-4 text-graphite-700">
        The bobweights are worked out once every part is weighed.
        {plan.error ? <span className="mt-2 block text-replace">{plan.error.message}</span> : null}
      </p>
    );
  }
  const oil = oilAllowanceLine(result, show, unit);
  const preset = findLayoutPreset(job.spec.layout ?? "");
  const replaced = preset && !preset.custom ? preset.replacedBy : undefined;
  return (
    <div className="space-y-6">
      {result.bobweightNeeded ? (
        <>
          <div className="flex flex-wrap items-baseline justify-between gap-2">
            <h2 className="text-xl font-semibold">Bobweights</h2>
            <a
              href={`/jobs/${jobId}/bobweights/tag`}
              className="btn-secondary"
              target="_blank"
              rel="noopener"
            >
              Print tag for the balancer
            </a>
          </div>
          {replaced ? (
            <p
              className="rounded border border-amber-300 bg-amber-50 p-3 text-sm text-graphite-800"
              data-testid="layout-replaced"
            >
              This job uses the older V-twin layout, worked out at 60 %. A 90° V-twin needs 50 %:
              choose the V angle (the 90° or the narrower V-twin layout) in the job&apos;s settings,
              or give the engine maker&apos;s factor.
            </p>
          ) : null}
          {oil.none ? (
            <p
              className="rounded-md border-2 border-replace bg-red-50 p-3 text-sm text-graphite-900"
              role="alert"
              data-testid="no-oil-allowance"
            >
              <strong>No oil allowance is included.</strong> Every bobweight is light by the oil the
              rods carry in service (2–5 g per rod is common practice). Set the job&apos;s oil
              allowance per rod unless the engine maker says otherwise.
            </p>
          ) : null}
          {result.buildTo.map((set) => (
            <BuildSet
              key={set.rodsPerPin}
              set={set}
              result={result}
              show={show}
              unit={unit}
              resolution={resolution}
            />
          ))}
          <p className="text-sm text-graphite-600" data-testid="bobweight-basis">
            Balance factor {result.balanceFactor} %, {oil.text}. From the finished weights
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
                <td className="py-1.5 pr-4">{show(c.rotating)}</td>
                <td className="py-1.5">{show(c.reciprocating)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <p className="text-xs text-graphite-500">
        Figures support, not replace, the machinist&apos;s judgement. Follow the engine maker&apos;s
        figures and the balancing machine&apos;s instructions, and wear eye protection at the
        balancer.
      </p>
    </div>
  );
}
