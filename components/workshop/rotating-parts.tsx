"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import {
  type FieldErrors,
  type Path,
  type Resolver,
  useFieldArray,
  useForm,
} from "react-hook-form";
import type { z } from "zod";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { RotatingPart } from "@/db/schema";
import { BALANCE_GRADES, convertMass, formatLength, formatUnbalance } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import {
  type CorrectionPlanes,
  ROTATING_UNIT_WORDS,
  type RotatingRecordInput,
  rotatingRecordSchemaIn,
} from "@/lib/validation/workshop";
import type { Workshop } from "@/lib/workshop/load";
import {
  figuresOf,
  planesOf,
  type RotatingCheck,
  type RotatingUnits,
  rotorMassUnit,
  unbalanceIn,
  unbalanceUnit,
  unitsOf,
} from "@/lib/workshop/rotating";
import { CorrectionHelpers } from "./correction-helpers";
import { useReloadWorkshop, useWorkshop, workshopKey } from "./use-workshop";

const PARTS: { part: RotatingPart; label: string }[] = [
  { part: "crankshaft", label: "Crankshaft" },
  { part: "flywheel", label: "Flywheel / flexplate" },
  { part: "clutch", label: "Clutch cover" },
  { part: "damper", label: "Damper / balancer pulley" },
];

const METHODS: { value: string; label: string }[] = [
  { value: "drilled", label: "Drilled out" },
  { value: "heavy-metal", label: "Heavy metal fitted" },
  { value: "added", label: "Weight added" },
  { value: "other", label: "Other" },
];

type Parsed = z.output<ReturnType<typeof rotatingRecordSchemaIn>>;
type Reading = { mass: string; angle?: string | null } | null;
type Correction = {
  plane: "A" | "B";
  method: string;
  where: string;
  mass: string;
  angle?: string | null;
};
/** What the boxes hold, in the record's units; the schema turns blanks into "not given". */
type Values = {
  massUnit: RotatingUnits["mass"];
  lengthUnit: RotatingUnits["length"];
  rotorMass?: string | null;
  rpm?: number | null;
  grade?: string | null;
  radius?: string | null;
  planes: CorrectionPlanes;
  planeDistanceA?: string | null;
  planeDistanceB?: string | null;
  before?: { A?: Reading; B?: Reading };
  after?: { A?: Reading; B?: Reading };
  corrections?: Correction[];
  notes?: string | null;
};

/** A save's outcome; `stale` holds a refusal because the record changed elsewhere (409). */
type Status = { ok: boolean; text: string; stale?: unknown } | null;

const LENGTH_WORDS = { mm: "millimetres", in: "inches" } as const;

/**
 * The units a part's record is typed in: a saved record keeps the units it was typed in (one
 * saved before units were kept is grams and mm); a new one takes the job's.
 */
function recordUnits(part: RotatingPart, workshop: Workshop): RotatingUnits {
  const record = workshop.rotating.find((r) => r.part === part);
  if (record) return unitsOf((record.data ?? {}) as RotatingRecordInput);
  return { mass: workshop.job.spec.massUnit, length: workshop.job.spec.lengthUnit ?? "mm" };
}

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
  // Held here, not in the form: a save remounts the form on the record's new version, and the
  // outcome must outlive that.
  const [status, setStatus] = useState<Status>(null);
  const units = recordUnits(open, workshop);
  const jobUnits: RotatingUnits = {
    mass: workshop.job.spec.massUnit,
    length: workshop.job.spec.lengthUnit ?? "mm",
  };
  const asJob = units.mass === jobUnits.mass && units.length === jobUnits.length;
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
      <p className="text-sm text-graphite-600" data-testid="rotating-units">
        Balancer readings and corrections in {ROTATING_UNIT_WORDS[units.mass].mass}, the rotor in{" "}
        {rotorMassUnit(units.mass)}, radii in {LENGTH_WORDS[units.length]}
        {asJob
          ? "."
          : `: this record was saved in these units and is shown as typed (the job is now in ${ROTATING_UNIT_WORDS[jobUnits.mass].mass} and ${LENGTH_WORDS[jobUnits.length]}).`}
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
              onClick={() => {
                setOpen(p.part);
                setStatus(null);
              }}
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
        status={status}
        setStatus={setStatus}
      />
      {canEdit ? <CorrectionHelpers part={open} workshop={workshop} /> : null}
    </div>
  );
}

const blankReading = () => ({ mass: "", angle: "" });

function initialValues(part: RotatingPart, workshop: Workshop): Values {
  const record = workshop.rotating.find((r) => r.part === part);
  const saved = (record?.data ?? {}) as RotatingRecordInput;
  const units = recordUnits(part, workshop);
  // Older records hold kg and mm under their own names: shown (and saved again) as typed.
  const figures = figuresOf({ ...saved, massUnit: units.mass, lengthUnit: units.length });
  const reading = (r: Reading | undefined) =>
    r ? { mass: r.mass, angle: r.angle ?? "" } : blankReading();
  return {
    massUnit: units.mass,
    lengthUnit: units.length,
    rotorMass: figures.rotorMass?.entered ?? "",
    rpm: saved.rpm ?? workshop.job.spec.maxRpm ?? null,
    grade: (saved.grade ?? "6.3").replace(/^G\s*/i, ""),
    radius: figures.radius?.entered ?? "",
    planes: planesOf(part, saved),
    planeDistanceA: figures.planeDistances?.A.entered ?? saved.planeDistanceA ?? "",
    planeDistanceB: figures.planeDistances?.B.entered ?? saved.planeDistanceB ?? "",
    before: { A: reading(saved.before?.A), B: reading(saved.before?.B) },
    after: { A: reading(saved.after?.A), B: reading(saved.after?.B) },
    corrections: (saved.corrections ?? []).map((c) => ({ ...c, angle: c.angle ?? "" })),
    notes: saved.notes ?? "",
  };
}

/** How many boxes a failed check marked. */
function countErrors(errors: FieldErrors): number {
  let n = 0;
  const walk = (node: unknown) => {
    if (!node || typeof node !== "object") return;
    if ("message" in node && typeof (node as { message: unknown }).message === "string") n += 1;
    for (const [key, child] of Object.entries(node))
      if (key !== "ref" && key !== "message" && key !== "type") walk(child);
  };
  walk(errors);
  return n;
}

function RecordForm({
  jobId,
  part,
  workshop,
  canEdit,
  status,
  setStatus,
}: {
  jobId: number;
  part: RotatingPart;
  workshop: Workshop;
  canEdit: boolean;
  status: Status;
  setStatus: (status: Status) => void;
}) {
  const client = useQueryClient();
  const latest = useReloadWorkshop(jobId);
  const record = workshop.rotating.find((r) => r.part === part);
  const units = recordUnits(part, workshop);
  const words = ROTATING_UNIT_WORDS[units.mass];
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(rotatingRecordSchemaIn(units.mass)) as unknown as Resolver<
      Values,
      unknown,
      Parsed
    >,
    defaultValues: initialValues(part, workshop),
  });
  const corrections = useFieldArray({ control: form.control, name: "corrections" });
  const planes = form.watch("planes");
  const planeNames: ("A" | "B")[] = planes === "one" ? ["A"] : ["A", "B"];
  const save = useMutation({
    mutationFn: (values: Parsed) =>
      apiFetch(`/api/jobs/${jobId}/rotating/${part}`, {
        method: "PUT",
        body: { data: values, version: record?.version ?? 0 },
      }),
    onMutate: () => setStatus(null),
    onSuccess: async () => {
      setStatus({ ok: true, text: "Saved." });
      await client.invalidateQueries({ queryKey: workshopKey(jobId) });
    },
    onError: (error) => {
      if (isStaleWrite(error)) {
        setStatus({ ok: false, text: "", stale: error });
        return;
      }
      if (error instanceof ApiError && error.status === 422) {
        const fields = Object.entries(error.fields);
        for (const [field, message] of fields)
          form.setError(field.replace(/^data\./, "") as Path<Values>, { message });
        setStatus({
          ok: false,
          text: `Not saved: ${fields.length === 1 ? "one box needs" : `${fields.length} boxes need`} attention (marked below).`,
        });
        return;
      }
      setStatus({ ok: false, text: `Not saved: ${error.message}` });
    },
  });

  const choosePlanes = (next: CorrectionPlanes) => {
    form.setValue("planes", next);
    if (next === "one") {
      // One plane keeps no plane B figures: nothing hidden may block the save.
      form.setValue("before.B", blankReading());
      form.setValue("after.B", blankReading());
      form.setValue("planeDistanceA", "");
      form.setValue("planeDistanceB", "");
      corrections.fields.forEach((_, i) => form.setValue(`corrections.${i}.plane`, "A"));
    }
  };

  const errors = form.formState.errors;
  const input = "w-28 rounded border border-graphite-300 px-2 py-1.5 font-mono";
  const err = (m?: { message?: string }, id?: string) =>
    m?.message ? (
      <span id={id} className="block max-w-48 text-xs text-replace">
        {m.message}
      </span>
    ) : null;
  return (
    <form
      className="panel grid gap-6 p-4 lg:grid-cols-[1fr_22rem]"
      onSubmit={form.handleSubmit(
        (v) => save.mutate(v),
        (e) => {
          const n = countErrors(e);
          setStatus({
            ok: false,
            text: `Not saved: ${n === 1 ? "one box needs" : `${n} boxes need`} attention (marked below).`,
          });
        },
      )}
      noValidate
    >
      <fieldset disabled={!canEdit} className="min-w-0 space-y-4">
        <div className="flex flex-wrap gap-4">
          <label className="text-sm">
            <span className="block font-semibold">Mass ({rotorMassUnit(units.mass)})</span>
            <input className={input} inputMode="decimal" {...form.register("rotorMass")} />
            {err(errors.rotorMass)}
          </label>
          <label className="text-sm">
            <span className="block font-semibold">Max service speed (rpm)</span>
            <input
              className={input}
              inputMode="numeric"
              {...form.register("rpm", {
                setValueAs: (v) => (v === "" || v === null ? null : Number(v)),
              })}
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
            <span className="block font-semibold">Balancer reading radius ({units.length})</span>
            <input className={input} inputMode="decimal" {...form.register("radius")} />
            {err(errors.radius)}
          </label>
        </div>
        <fieldset className="flex flex-wrap items-center gap-4 text-sm">
          <legend className="mb-1 font-semibold">Correction planes</legend>
          {(["one", "two"] as const).map((choice) => (
            <label key={choice} className="flex items-center gap-1">
              <input
                type="radio"
                name={`planes-${part}`}
                value={choice}
                checked={planes === choice}
                onChange={() => choosePlanes(choice)}
              />
              {choice === "one"
                ? "One plane (flexplate, flywheel, clutch cover, damper): the whole allowance there"
                : "Two planes, A and B (a crankshaft)"}
            </label>
          ))}
        </fieldset>
        {planes === "two" ? (
          <div className="flex flex-wrap gap-4">
            <label className="text-sm">
              <span className="block font-semibold">
                Plane A from centre of mass ({units.length}, optional)
              </span>
              <input className={input} inputMode="decimal" {...form.register("planeDistanceA")} />
              {err(errors.planeDistanceA)}
            </label>
            <label className="text-sm">
              <span className="block font-semibold">
                Plane B from centre of mass ({units.length}, optional)
              </span>
              <input className={input} inputMode="decimal" {...form.register("planeDistanceB")} />
              {err(errors.planeDistanceB)}
            </label>
          </div>
        ) : null}
        {(["before", "after"] as const).map((side) => (
          <div key={side}>
            <h3 className="font-semibold">
              {side === "before"
                ? "Balancer readings before correction"
                : "Balancer readings after correction"}
            </h3>
            <div className="mt-1 flex flex-wrap gap-6">
              {planeNames.map((plane) => {
                const name = planes === "one" ? "single plane" : `plane ${plane}`;
                const e = errors[side]?.[plane];
                return (
                  <div key={plane} className="flex items-start gap-2 text-sm">
                    <span className="pt-6 font-mono font-semibold">
                      {planes === "one" ? "Reading" : `Plane ${plane}`}
                    </span>
                    <label>
                      <span className="block">{words.mass}</span>
                      <input
                        className={input}
                        inputMode="decimal"
                        aria-label={`${side} ${name} ${words.mass}`}
                        aria-invalid={e?.mass ? true : undefined}
                        {...form.register(`${side}.${plane}.mass`)}
                      />
                      {err(e?.mass)}
                    </label>
                    <label>
                      <span className="block">angle °</span>
                      <input
                        className={input}
                        inputMode="decimal"
                        aria-label={`${side} ${name} angle`}
                        aria-invalid={e?.angle ? true : undefined}
                        {...form.register(`${side}.${plane}.angle`)}
                      />
                      {err(e?.angle)}
                    </label>
                  </div>
                );
              })}
            </div>
          </div>
        ))}
        <div>
          <h3 className="font-semibold">Corrections made</h3>
          <ul className="space-y-2">
            {corrections.fields.map((f, i) => {
              const e = errors.corrections?.[i];
              const messages = [e?.plane, e?.method, e?.where, e?.mass, e?.angle]
                .map((m) => m?.message)
                .filter((m): m is string => Boolean(m));
              return (
                <li key={f.id} className="text-sm" data-testid={`correction-${i}`}>
                  <div className="flex flex-wrap items-end gap-2">
                    {planes === "two" ? (
                      <select
                        className={input}
                        aria-label={`Correction ${i + 1} plane`}
                        {...form.register(`corrections.${i}.plane`)}
                      >
                        <option value="A">Plane A</option>
                        <option value="B">Plane B</option>
                      </select>
                    ) : null}
                    <select
                      className="rounded border border-graphite-300 px-2 py-1.5"
                      aria-label={`Correction ${i + 1} method`}
                      {...form.register(`corrections.${i}.method`)}
                    >
                      {METHODS.map((m) => (
                        <option key={m.value} value={m.value}>
                          {m.label}
                        </option>
                      ))}
                    </select>
                    <input
                      className="w-56 rounded border border-graphite-300 px-2 py-1.5"
                      placeholder="Where (e.g. rear counterweight)"
                      aria-label={`Correction ${i + 1} where`}
                      {...form.register(`corrections.${i}.where`)}
                    />
                    <input
                      className={input}
                      inputMode="decimal"
                      placeholder={words.mass}
                      aria-label={`Correction ${i + 1} ${words.mass}`}
                      aria-invalid={e?.mass ? true : undefined}
                      {...form.register(`corrections.${i}.mass`)}
                    />
                    <input
                      className="w-20 rounded border border-graphite-300 px-2 py-1.5 font-mono"
                      inputMode="decimal"
                      placeholder="angle °"
                      aria-label={`Correction ${i + 1} angle`}
                      aria-invalid={e?.angle ? true : undefined}
                      {...form.register(`corrections.${i}.angle`)}
                    />
                    <button
                      type="button"
                      className="text-sm underline"
                      onClick={() => corrections.remove(i)}
                    >
                      Remove
                    </button>
                  </div>
                  {messages.length > 0 ? (
                    <p className="text-xs text-replace" data-testid={`correction-${i}-error`}>
                      Correction {i + 1}: {messages.join(" ")}
                    </p>
                  ) : null}
                </li>
              );
            })}
          </ul>
          <button
            type="button"
            className="btn-secondary mt-2 py-1"
            onClick={() =>
              corrections.append({ plane: "A", method: "drilled", where: "", mass: "", angle: "" })
            }
          >
            Add a correction
          </button>
        </div>
        <label className="block text-sm">
          <span className="block font-semibold">Notes</span>
          <textarea className="field-input" rows={2} {...form.register("notes")} />
          {err(errors.notes)}
        </label>
        {canEdit ? (
          <div className="flex flex-wrap items-center gap-3">
            <button type="submit" className="btn-primary" disabled={save.isPending}>
              {save.isPending ? "Saving…" : "Save record"}
            </button>
            <span
              role="status"
              aria-live="polite"
              className="text-sm"
              data-testid="rotating-save-status"
            >
              {status?.stale ? (
                <ChangedElsewhere
                  inline
                  what={`this ${PARTS.find((p) => p.part === part)?.label.toLowerCase() ?? part} record`}
                  error={status.stale}
                  loading={latest.loading}
                  onReload={() =>
                    void latest.reload().then((fresh) => {
                      if (fresh) setStatus(null);
                    })
                  }
                />
              ) : status ? (
                <span className={status.ok ? "text-within" : "text-replace"}>{status.text}</span>
              ) : null}
            </span>
          </div>
        ) : null}
      </fieldset>
      <Verdict check={record?.check ?? null} data={(record?.data ?? {}) as RotatingRecordInput} />
    </form>
  );
}

/**
 * The verdict leads with the mass at the balancer radius, then the unbalance and the ISO terms,
 * all in the record's units (g or oz, mm or in); pass or fail is the engine's, in g and mm.
 */
function Verdict({ check, data }: { check: RotatingCheck | null; data: RotatingRecordInput }) {
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
  const units = check.units ?? unitsOf(data);
  const figures = figuresOf(data);
  const single = check.planes === "one";
  const radius = `${formatLength(figures.radius?.entered ?? check.radiusMm!)} ${units.length}`;
  const name = (plane: string) => (single ? "" : `Plane ${plane}: `);
  const allowance = new Map(check.allowances.map((a) => [a.plane, a]));
  // A mass at the radius (g) and an unbalance (g·mm) in the record's units, by the display rule.
  const mass = (g: string) => `${formatUnbalance(convertMass(g, "g", units.mass))} ${units.mass}`;
  const unbalance = (gmm: string) =>
    `${formatUnbalance(unbalanceIn(gmm, units))} ${unbalanceUnit(units)}`;
  return (
    <aside className="space-y-3 text-sm" data-testid="rotating-verdict">
      {(["after", "before"] as const).map((side) => {
        const c = check[side];
        if (!c) {
          return side === "after" ? (
            <p key={side} className="text-graphite-600">
              After: {single ? "no reading yet." : "enter both planes' readings for a verdict."}
            </p>
          ) : null;
        }
        return (
          <div key={side} className={`rounded p-2 ${c.pass ? "bg-emerald-50" : "bg-red-50"}`}>
            <p className={`font-semibold ${c.pass ? "text-within" : "text-replace"}`}>
              {side === "before" ? "Before" : "After"}:{" "}
              {c.pass ? "within the grade" : "over the grade"}
            </p>
            <ul>
              {c.planes.map((pl) => {
                const reading = data[side]?.[pl.plane as "A" | "B"]?.mass ?? "";
                const allowed = allowance.get(pl.plane as "A" | "B");
                return (
                  <li key={pl.plane}>
                    {name(pl.plane)}Residual {reading} {units.mass} at {radius} — allowed{" "}
                    {allowed ? mass(allowed.massAtRadius) : "?"}:{" "}
                    <span className="font-semibold">{pl.pass ? "pass" : "fail"}</span>
                    <span className="block font-mono text-xs text-graphite-600">
                      {formatUnbalance(unbalanceIn(pl.residual, units))} of {unbalance(pl.allowed)}{" "}
                      ({pl.pass ? "margin" : "over by"} {unbalance(pl.margin.replace("-", ""))})
                      {pl.angle ? `, heavy spot at ${pl.angle}°` : ""}
                    </span>
                  </li>
                );
              })}
            </ul>
          </div>
        );
      })}
      <div className="text-graphite-700">
        <p className="font-semibold">
          Allowed residual, G {p.grade} at {data.rpm} rpm
        </p>
        <ul>
          {check.allowances.map((a) => (
            <li key={a.plane}>
              {single ? "In the one plane" : `Plane ${a.plane}`}: {mass(a.massAtRadius)} at {radius}
              {a.clamped ? " (share held to 30–70 %)" : ""}
            </li>
          ))}
        </ul>
        <p className="mt-1 font-mono text-xs text-graphite-600">
          ISO 21940-11: U_per {unbalance(p.uPer)} for the whole part
          {single
            ? ", all in one plane"
            : p.allocation === "half-each"
              ? ", half each plane"
              : ", shared by distance"}
          ; e_per {formatUnbalance(unbalanceIn(p.ePer, units, true))} {unbalanceUnit(units)}/
          {rotorMassUnit(units.mass)}.
        </p>
      </div>
    </aside>
  );
}
