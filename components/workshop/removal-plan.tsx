"use client";

import { useMutation } from "@tanstack/react-query";
import { useState } from "react";
import type { PartKind } from "@/db/schema";
import { formatMass, MATERIAL_DENSITIES, type PartResult } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import type { Workshop } from "@/lib/workshop/load";
import type { WorkshopPlan } from "@/lib/workshop/plan";
import { KIND_LABEL } from "./part-kinds";
import { PartChart } from "./part-chart";
import { useUpdateWorkshop, useWorkshop } from "./use-workshop";

const STATUS: Record<PartResult["status"], { label: string; className: string }> = {
  ok: { label: "In band", className: "bg-emerald-50 text-within" },
  remove: { label: "Take off", className: "bg-amber-50 text-machine" },
  light: { label: "Too light", className: "bg-red-50 text-replace font-semibold" },
};

export function StatusTag({ status }: { status: PartResult["status"] }) {
  const s = STATUS[status];
  return (
    <span className={`inline-block rounded px-2 py-0.5 text-xs ${s.className}`}>{s.label}</span>
  );
}

/** Per kind of part: target, tolerance and, part by part, the metal to take off. */
export function RemovalPlan({
  jobId,
  initial,
  canEdit,
}: {
  jobId: number;
  initial: Workshop;
  canEdit: boolean;
}) {
  const { data } = useWorkshop(jobId, initial);
  const workshop = data ?? initial;
  const { plan, job } = workshop;
  const res = job.spec.scaleResolution;
  const unit = job.spec.massUnit;
  const fmt = (v: string) => formatMass(v, res);

  if (!plan.complete || !plan.removal) {
    return (
      <div className="panel p-4 text-graphite-700">
        <p>The plan appears once every part is weighed.</p>
        {plan.error ? <p className="mt-2 text-replace">{plan.error.message}</p> : null}
        {plan.missing.length > 0 ? (
          <p className="mt-2 text-sm">
            Missing:{" "}
            {plan.missing
              .slice(0, 12)
              .map((m) => `cyl. ${m.cylinder} ${KIND_LABEL[m.kind].toLowerCase()}`)
              .join(", ")}
            {plan.missing.length > 12 ? ` and ${plan.missing.length - 12} more` : ""}.
          </p>
        ) : null}
      </div>
    );
  }

  const removal = plan.removal;
  const kinds = [...new Set(removal.parts.map((p) => p.kind))].filter((k) => k !== "bearing");
  const light = removal.parts.filter((p) => p.status === "light");
  const reweighed = new Map(
    workshop.weights
      .filter((w) => w.phase === "final")
      .map((w) => [`${w.cylinder}:${w.kind}`, w.readings]),
  );
  const finishedByKey = new Map(plan.finished?.parts.map((p) => [`${p.cylinder}:${p.kind}`, p]));

  return (
    <div className="space-y-6">
      {light.length > 0 ? (
        <section
          className="rounded-md border-2 border-replace bg-red-50 p-4"
          data-testid="replace-parts"
        >
          <h2 className="font-semibold text-replace">Parts to replace or add weight to</h2>
          <ul className="mt-1 list-disc pl-5 text-sm">
            {light.map((p) => (
              <li key={`${p.cylinder}:${p.kind}`}>
                Cylinder {p.cylinder} {KIND_LABEL[p.kind].toLowerCase()}: {fmt(p.measured)} {unit},
                below the target of{" "}
                {fmt(removal.targets[p.kind as keyof typeof removal.targets] ?? "0")} {unit}. Metal
                cannot be put back by machining.
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      <p className="text-sm text-graphite-600">
        Tolerance: the finished set within {removal.tolerance} {unit}. Weights shown to the scale
        resolution ({res} {unit}).
        {job.spec.drillDiameterMm
          ? ` Drill depths for a ${job.spec.drillDiameterMm} mm drill, 118° point.`
          : " Set a drill size on the overview to see drill depths."}
      </p>

      {kinds.map((kind) => (
        <KindTable
          key={kind}
          jobId={jobId}
          kind={kind}
          plan={plan}
          workshop={workshop}
          canEdit={canEdit}
          reweighed={reweighed}
          finishedByKey={finishedByKey}
          fmt={fmt}
        />
      ))}

      <Pairing jobId={jobId} plan={plan} canEdit={canEdit} unit={unit} fmt={fmt} />

      {removal.warnings.length > 0 ? (
        <section className="panel p-4">
          <h2 className="mb-1 font-semibold">Worth a second look</h2>
          <ul className="list-disc pl-5 text-sm text-graphite-700">
            {removal.warnings.map((w, i) => (
              <li key={i}>{w.message}</li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}

function KindTable({
  jobId,
  kind,
  plan,
  workshop,
  canEdit,
  reweighed,
  finishedByKey,
  fmt,
}: {
  jobId: number;
  kind: PartKind;
  plan: WorkshopPlan;
  workshop: Workshop;
  canEdit: boolean;
  reweighed: Map<string, string[]>;
  finishedByKey: Map<string, PartResult>;
  fmt: (v: string) => string;
}) {
  const removal = plan.removal!;
  const unit = workshop.job.spec.massUnit;
  const parts = removal.parts.filter((p) => p.kind === kind);
  const target = removal.targets[kind as keyof typeof removal.targets];
  const setTarget = workshop.targets.find((t) => t.kind === kind);
  const hasDrill = parts.some((p) => plan.drill[`${p.cylinder}:${p.kind}`]);
  return (
    <section className="panel" aria-labelledby={`kind-${kind}`}>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-graphite-200 px-4 py-3">
        <h2 id={`kind-${kind}`} className="text-lg font-semibold">
          {KIND_LABEL[kind]}
        </h2>
        <TargetEditor
          jobId={jobId}
          kind={kind}
          current={target ?? null}
          isSet={Boolean(setTarget?.target)}
          version={setTarget?.version ?? 0}
          canEdit={canEdit}
          unit={unit}
        />
      </div>
      <div className="grid gap-4 p-4 lg:grid-cols-[1fr_22rem]">
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="text-left text-graphite-500">
              <tr>
                <th className="py-1 pr-3 font-semibold">Cyl.</th>
                <th className="py-1 pr-3 font-semibold">Weighed</th>
                <th className="py-1 pr-3 font-semibold">Take off</th>
                {hasDrill ? <th className="py-1 pr-3 font-semibold">Drill to (tip)</th> : null}
                <th className="py-1 pr-3 font-semibold">Finished</th>
                <th className="py-1 pr-3 font-semibold">Re-weighed</th>
                <th className="py-1 font-semibold">State</th>
              </tr>
            </thead>
            <tbody className="font-mono">
              {parts.map((p) => {
                const key = `${p.cylinder}:${p.kind}`;
                const drill = plan.drill[key];
                const after = reweighed.get(key);
                const finished = finishedByKey.get(key);
                return (
                  <tr key={key} className="border-t border-graphite-100">
                    <td className="py-1.5 pr-3">{p.cylinder}</td>
                    <td className="py-1.5 pr-3">
                      {fmt(p.measured)}
                      {p.readings && p.readings.length > 1 ? (
                        <span className="ml-1 text-xs text-graphite-500">spread {p.spread}</span>
                      ) : null}
                    </td>
                    <td className="py-1.5 pr-3 text-lg font-semibold">
                      {p.status === "remove" ? fmt(p.remove) : "—"}
                    </td>
                    {hasDrill ? (
                      <td
                        className="py-1.5 pr-3"
                        title={drill ? MATERIAL_DENSITIES[drill.material].label : undefined}
                      >
                        {drill ? `${formatMass(drill.tipDepth, "0.1")} mm` : "—"}
                      </td>
                    ) : null}
                    <td className="py-1.5 pr-3">{fmt(p.final)}</td>
                    <td className="py-1.5 pr-3">
                      {after ? (
                        <>
                          {after.join(" ")}
                          {finished && finished.status !== "ok" ? (
                            <span className="ml-1 font-sans text-xs text-machine">
                              {finished.status === "remove"
                                ? `still ${fmt(finished.remove)} over`
                                : "now light"}
                            </span>
                          ) : null}
                        </>
                      ) : (
                        "—"
                      )}
                    </td>
                    <td className="py-1.5 font-sans">
                      <StatusTag status={p.status} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <PartChart
          parts={parts}
          finished={parts.map((p) => finishedByKey.get(`${p.cylinder}:${p.kind}`))}
          target={target ?? "0"}
          tolerance={removal.tolerance}
          unit={unit}
        />
      </div>
    </section>
  );
}

function TargetEditor(props: {
  jobId: number;
  kind: PartKind;
  current: string | null;
  isSet: boolean;
  version: number;
  canEdit: boolean;
  unit: string;
}) {
  const update = useUpdateWorkshop(props.jobId);
  const [value, setValue] = useState(props.isSet ? (props.current ?? "") : "");
  const [message, setMessage] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: (target: string | null) =>
      apiFetch<{
        plan: WorkshopPlan;
        target: { kind: PartKind; target: string | null; version: number };
      }>(`/api/jobs/${props.jobId}/targets`, {
        method: "PUT",
        body: { kind: props.kind, target, version: props.version },
      }),
    onSuccess: (r) => {
      update((w) => ({
        ...w,
        plan: r.plan,
        targets: [...w.targets.filter((t) => t.kind !== props.kind), r.target],
      }));
      setMessage("saved");
    },
    onError: (e) =>
      setMessage(e instanceof ApiError ? (Object.values(e.fields)[0] ?? e.message) : "not saved"),
  });
  if (!props.canEdit) {
    return (
      <p className="text-sm">
        Target <span className="font-mono font-semibold">{props.current}</span> {props.unit}
      </p>
    );
  }
  return (
    <form
      className="flex flex-wrap items-center gap-2 text-sm"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(value.trim() === "" ? null : value.trim());
      }}
    >
      <label htmlFor={`target-${props.kind}`}>
        Target ({props.isSet ? "set by hand" : "the lightest"}) {props.unit}
      </label>
      <input
        id={`target-${props.kind}`}
        value={value}
        placeholder={props.current ?? ""}
        onChange={(e) => setValue(e.target.value)}
        inputMode="decimal"
        className="w-24 rounded border border-graphite-300 px-2 py-1 font-mono"
      />
      <button type="submit" className="btn-secondary py-1" disabled={save.isPending}>
        {value.trim() === "" ? "Use lightest" : "Set target"}
      </button>
      <span aria-live="polite" className="text-xs text-graphite-500">
        {message}
      </span>
    </form>
  );
}

function Pairing({
  jobId,
  plan,
  canEdit,
  unit,
  fmt,
}: {
  jobId: number;
  plan: WorkshopPlan;
  canEdit: boolean;
  unit: string;
  fmt: (v: string) => string;
}) {
  const update = useUpdateWorkshop(jobId);
  const apply = useMutation({
    mutationFn: () =>
      apiFetch<Workshop>(`/api/jobs/${jobId}/pairing`, {
        method: "POST",
        body: {
          assignment: plan.pairing!.assignment.map((a) => ({
            rodCylinder: a.rodCylinder,
            pistonFromCylinder: a.pistonFromCylinder,
          })),
        },
      }),
    onSuccess: (w) => update(() => w),
  });
  const pairing = plan.pairing;
  if (!pairing) return null;
  return (
    <section className="panel p-4" aria-labelledby="pairing-title">
      <h2 id="pairing-title" className="text-lg font-semibold">
        Piston-to-rod pairing
      </h2>
      {!pairing.changed ? (
        <p className="text-sm text-graphite-600">
          The pistons already sit on the rods that need the least metal removed.
        </p>
      ) : (
        <>
          <p className="text-sm text-graphite-700">
            Matched as whole reciprocating assemblies (piston, pin, retainers, rings and small end
            together), putting these pistons on these rods evens the set with{" "}
            <strong className="font-mono">
              {fmt(pairing.saved)} {unit}
            </strong>{" "}
            less metal taken off ({fmt(pairing.removedNumbered)} → {fmt(pairing.removedSuggested)}{" "}
            {unit}).
          </p>
          <ul className="mt-2 grid gap-1 font-mono text-sm sm:grid-cols-2 lg:grid-cols-4">
            {pairing.assignment
              .filter((a) => a.rodCylinder !== a.pistonFromCylinder)
              .map((a) => (
                <li key={a.rodCylinder}>
                  rod {a.rodCylinder} ← piston {a.pistonFromCylinder}
                </li>
              ))}
          </ul>
          {canEdit ? (
            <button
              type="button"
              className="btn-primary mt-3"
              onClick={() => apply.mutate()}
              disabled={apply.isPending}
            >
              {apply.isPending ? "Moving…" : "Apply this pairing"}
            </button>
          ) : null}
          {apply.isError ? (
            <p className="mt-2 text-sm text-replace">{apply.error.message}</p>
          ) : null}
        </>
      )}
    </section>
  );
}
