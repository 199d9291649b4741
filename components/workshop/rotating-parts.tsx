"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { type Resolver, useFieldArray, useForm } from "react-hook-form";
import type { z } from "zod";
import type { RotatingPart } from "@/db/schema";
import { BALANCE_GRADES, formatMass } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { rotatingRecordSchema } from "@/lib/validation/workshop";
import type { Workshop } from "@/lib/workshop/load";
import type { RotatingCheck } from "@/lib/workshop/rotating";
import { useWorkshop, workshopKey } from "./use-workshop";

const PARTS: { part: RotatingPart; label: string }[] = [
  { part: "crankshaft", label: "Crankshaft" },
  { part: "flywheel", label: "Flywheel / flexplate" },
  { part: "clutch", label: "Clutch cover" },
  { part: "damper", label: "Damper / balancer pulley" },
];

type Parsed = z.output<typeof rotatingRecordSchema>;
type Reading = { mass: string; angle?: string | null } | null;
/** What the boxes hold; the schema turns blanks into "not given". */
type Values = {
  massKg?: string | null;
  rpm?: number | null;
  grade?: string | null;
  radiusMm?: string | null;
  planeDistanceAMm?: string | null;
  planeDistanceBMm?: string | null;
  before?: { A?: Reading; B?: Reading };
  after?: { A?: Reading; B?: Reading };
  corrections?: NonNullable<Parsed["corrections"]>;
  notes?: string | null;
};

/** The crank and the other rotating parts on the balancer: readings, corrections, pass or fail. */
export function RotatingParts({
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
  const [open, setOpen] = useState<RotatingPart>("crankshaft");
  return (
    <div className="space-y-4">
      <p className="text-sm text-graphite-600">
        Balance type:{" "}
        {workshop.job.spec.balanceType === "external"
          ? "externally balanced"
          : workshop.job.spec.balanceType === "internal"
            ? "internally balanced"
            : "not noted yet (set it on the overview)"}
        . Permissible residual unbalance per ISO 21940-11 from the part&apos;s mass, the service
        speed and the grade; performance work usually aims at G 2.5 or better (common practice).
      </p>
      <div className="flex flex-wrap gap-2" role="tablist" aria-label="Rotating part">
        {PARTS.map((p) => {
          const record = workshop.rotating.find((r) => r.part === p.part);
          const verdict = record?.check.after
            ? record.check.after.pass
              ? "within grade"
              : "over grade"
            : record
              ? "recorded"
              : "not recorded";
          return (
            <button
              key={p.part}
              role="tab"
              aria-selected={open === p.part}
              type="button"
              onClick={() => setOpen(p.part)}
              className={`rounded border px-3 py-2 text-left text-sm ${open === p.part ? "border-brass-500 bg-brass-50" : "border-graphite-200 bg-white"}`}
            >
              <span className="block font-semibold">{p.label}</span>
              <span className="text-xs text-graphite-500">{verdict}</span>
            </button>
          );
        })}
      </div>
      <RecordForm
        key={`${open}-${workshop.rotating.find((r) => r.part === open)?.version ?? 0}`}
        jobId={jobId}
        part={open}
        workshop={workshop}
        canEdit={canEdit}
      />
    </div>
  );
}

function RecordForm({
  jobId,
  part,
  workshop,
  canEdit,
}: {
  jobId: number;
  part: RotatingPart;
  workshop: Workshop;
  canEdit: boolean;
}) {
  const client = useQueryClient();
  const record = workshop.rotating.find((r) => r.part === part);
  const saved = (record?.data ?? {}) as Values;
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(rotatingRecordSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: {
      massKg: saved.massKg ?? "",
      rpm: saved.rpm ?? workshop.job.spec.maxRpm ?? undefined,
      grade: saved.grade ?? "6.3",
      radiusMm: saved.radiusMm ?? "",
      planeDistanceAMm: saved.planeDistanceAMm ?? "",
      planeDistanceBMm: saved.planeDistanceBMm ?? "",
      before: saved.before ?? { A: { mass: "", angle: "" }, B: { mass: "", angle: "" } },
      after: saved.after ?? { A: { mass: "", angle: "" }, B: { mass: "", angle: "" } },
      corrections: saved.corrections ?? [],
      notes: saved.notes ?? "",
    },
  });
  const corrections = useFieldArray({ control: form.control, name: "corrections" });
  const save = useMutation({
    mutationFn: (values: Parsed) =>
      apiFetch(`/api/jobs/${jobId}/rotating/${part}`, {
        method: "PUT",
        body: { data: values, version: record?.version ?? 0 },
      }),
    onSuccess: () => client.invalidateQueries({ queryKey: workshopKey(jobId) }),
  });

  const errors = form.formState.errors;
  const input = "w-28 rounded border border-graphite-300 px-2 py-1.5 font-mono";
  const err = (m?: { message?: string }) =>
    m?.message ? <span className="block text-xs text-replace">{m.message}</span> : null;
  return (
    <form
      className="panel grid gap-6 p-4 lg:grid-cols-[1fr_20rem]"
      onSubmit={form.handleSubmit((v) => save.mutate(v))}
      noValidate
    >
      <fieldset disabled={!canEdit} className="space-y-4">
        <div className="flex flex-wrap gap-4">
          <label className="text-sm">
            <span className="block font-semibold">Mass (kg)</span>
            <input className={input} inputMode="decimal" {...form.register("massKg")} />
            {err(errors.massKg)}
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Max service speed (rpm)</span>
            <input
              className={input}
              inputMode="numeric"
              {...form.register("rpm", { setValueAs: (v) => (v === "" ? undefined : Number(v)) })}
            />
            {err(errors.rpm)}
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Balance grade</span>
            <select className={input} {...form.register("grade")}>
              {BALANCE_GRADES.map((g) => (
                <option key={g} value={g}>
                  G {g}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Balancer reading radius (mm)</span>
            <input className={input} inputMode="decimal" {...form.register("radiusMm")} />
            {err(errors.radiusMm)}
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Plane A from centre of mass (mm, optional)</span>
            <input className={input} inputMode="decimal" {...form.register("planeDistanceAMm")} />
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Plane B from centre of mass (mm, optional)</span>
            <input className={input} inputMode="decimal" {...form.register("planeDistanceBMm")} />
          </label>
        </div>
        {(["before", "after"] as const).map((side) => (
          <div key={side}>
            <h3 className="font-semibold">
              {side === "before"
                ? "Balancer readings before correction"
                : "Balancer readings after correction"}
            </h3>
            <div className="mt-1 flex flex-wrap gap-6">
              {(["A", "B"] as const).map((plane) => (
                <div key={plane} className="flex items-end gap-2 text-sm">
                  <span className="pb-2 font-mono font-semibold">Plane {plane}</span>
                  <label>
                    <span className="block">grams</span>
                    <input
                      className={input}
                      inputMode="decimal"
                      aria-label={`${side} plane ${plane} grams`}
                      {...form.register(`${side}.${plane}.mass`)}
                    />
                  </label>
                  <label>
                    <span className="block">angle °</span>
                    <input
                      className={input}
                      inputMode="decimal"
                      aria-label={`${side} plane ${plane} angle`}
                      {...form.register(`${side}.${plane}.angle`)}
                    />
                  </label>
                </div>
              ))}
            </div>
          </div>
        ))}
        <div>
          <h3 className="font-semibold">Corrections made</h3>
          <ul className="space-y-2">
            {corrections.fields.map((f, i) => (
              <li key={f.id} className="flex flex-wrap items-end gap-2 text-sm">
                <select
                  className={input}
                  aria-label="Plane"
                  {...form.register(`corrections.${i}.plane`)}
                >
                  <option value="A">Plane A</option>
                  <option value="B">Plane B</option>
                </select>
                <select
                  className="rounded border border-graphite-300 px-2 py-1.5"
                  aria-label="Method"
                  {...form.register(`corrections.${i}.method`)}
                >
                  <option value="drilled">Drilled out</option>
                  <option value="heavy-metal">Heavy metal fitted</option>
                  <option value="added">Weight added</option>
                  <option value="other">Other</option>
                </select>
                <input
                  className="w-56 rounded border border-graphite-300 px-2 py-1.5"
                  placeholder="Where (e.g. rear counterweight)"
                  aria-label="Where"
                  {...form.register(`corrections.${i}.where`)}
                />
                <input
                  className={input}
                  inputMode="decimal"
                  placeholder="grams"
                  aria-label="Grams"
                  {...form.register(`corrections.${i}.mass`)}
                />
                <button
                  type="button"
                  className="text-sm underline"
                  onClick={() => corrections.remove(i)}
                >
                  Remove
                </button>
              </li>
            ))}
          </ul>
          <button
            type="button"
            className="btn-secondary mt-2 py-1"
            onClick={() =>
              corrections.append({ plane: "A", method: "drilled", where: "", mass: "" })
            }
          >
            Add a correction
          </button>
        </div>
        <label className="block text-sm">
          <span className="block font-semibold">Notes</span>
          <textarea className="field-input" rows={2} {...form.register("notes")} />
        </label>
        {canEdit ? (
          <div className="flex items-center gap-3">
            <button type="submit" className="btn-primary" disabled={save.isPending}>
              {save.isPending ? "Saving…" : "Save record"}
            </button>
            <span aria-live="polite" className="text-sm">
              {save.isSuccess ? <span className="text-within">Saved.</span> : null}
              {save.isError ? (
                <span className="text-replace">
                  {save.error instanceof ApiError && save.error.status === 409
                    ? "Someone else saved this record meanwhile: reload to see theirs."
                    : save.error.message}
                </span>
              ) : null}
            </span>
          </div>
        ) : null}
      </fieldset>
      <Verdict check={record?.check ?? null} />
    </form>
  );
}

function Verdict({ check }: { check: RotatingCheck | null }) {
  if (!check)
    return (
      <aside className="text-sm text-graphite-500">
        Save the record to see the permissible residual per plane.
      </aside>
    );
  if (!check.permissible)
    return (
      <aside className="text-sm text-graphite-600">Still needed: {check.missing.join(", ")}.</aside>
    );
  const p = check.permissible;
  const g = (v: string) => formatMass(v, "0.1");
  return (
    <aside className="space-y-3 text-sm" data-testid="rotating-verdict">
      <div>
        <p className="font-semibold">Permissible residual (G {p.grade})</p>
        <p className="font-mono">
          e_per {g(p.ePer)} g·mm/kg · U_per {g(p.uPer)} g·mm
        </p>
        <ul className="mt-1 font-mono">
          {p.planes.map((pl) => (
            <li key={pl.plane}>
              Plane {pl.plane}: {g(pl.uPer)} g·mm
              {pl.massAtRadius ? ` = ${formatMass(pl.massAtRadius, "0.01")} g at the radius` : ""}
              {pl.clamped ? " (held to 30–70 %)" : ""}
            </li>
          ))}
        </ul>
      </div>
      {(["before", "after"] as const).map((side) => {
        const c = check[side];
        if (!c) return null;
        return (
          <div key={side} className={`rounded p-2 ${c.pass ? "bg-emerald-50" : "bg-red-50"}`}>
            <p className={`font-semibold ${c.pass ? "text-within" : "text-replace"}`}>
              {side === "before" ? "Before" : "After"}:{" "}
              {c.pass ? "within the grade" : "over the grade"}
            </p>
            <ul className="font-mono text-xs">
              {c.planes.map((pl) => (
                <li key={pl.plane}>
                  {pl.plane}: {g(pl.residual)} of {g(pl.allowed)} g·mm (
                  {pl.pass ? "margin" : "over by"} {g(pl.margin.replace("-", ""))})
                </li>
              ))}
            </ul>
          </div>
        );
      })}
    </aside>
  );
}
