"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import { z } from "zod";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { Job } from "@/db/jobs";
import { JOB_STATUSES } from "@/db/schema";
import { may } from "@/lib/auth/policy";
import { LAYOUT_PRESETS } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { jobSpecSchema } from "@/lib/validation/workshop";
import { lengthAsEntered, showDrillSize } from "@/lib/jobs/lengths";
import { needsBobweight } from "@/lib/jobs/needs-bobweight";
import { parseDrillMaterials } from "@/lib/workshop/plan";
import { STATUS_LABEL } from "./status";

const settingsSchema = jobSpecSchema
  .pick({
    layout: true,
    cylinders: true,
    massUnit: true,
    scaleResolution: true,
    scaleName: true,
    balancerName: true,
    tolerance: true,
    balanceFactor: true,
    oilAllowance: true,
    lengthUnit: true,
    bore: true,
    stroke: true,
    rodLength: true,
    drillSize: true,
    balanceType: true,
    matching: true,
    maxRpm: true,
    promisedDate: true,
  })
  .extend({
    rodMaterial: z.string(),
    pistonMaterial: z.string(),
    // Blank only on a job still on the older per-crankpin figure: it keeps that figure.
    oilAllowancePerRod: z.preprocess(
      (v) => (v === "" ? undefined : v),
      jobSpecSchema.shape.oilAllowancePerRod,
    ),
  });
type Values = z.input<typeof settingsSchema>;
type Parsed = z.output<typeof settingsSchema>;
type FieldName = keyof Values;

const UNIT_WORD = { g: "g", oz: "oz" } as const;

/** The form's boxes for a job as stored: lengths as typed, blanks for settings not given. */
function formValues(job: Job): Values {
  const s = job.spec;
  const materials = parseDrillMaterials(s.material);
  return {
    layout: s.layout ?? "custom",
    cylinders: s.cylinders === null ? "" : String(s.cylinders),
    massUnit: s.massUnit,
    scaleResolution: s.scaleResolution,
    scaleName: s.scaleName ?? "",
    balancerName: s.balancerName ?? "",
    tolerance: s.tolerance,
    balanceFactor: s.balanceFactor ?? "",
    oilAllowance: s.oilAllowance,
    oilAllowancePerRod: s.oilAllowancePerRod ?? "",
    lengthUnit: s.lengthUnit,
    bore: lengthAsEntered(s, "bore") ?? "",
    stroke: lengthAsEntered(s, "stroke") ?? "",
    rodLength: lengthAsEntered(s, "rodLength") ?? "",
    drillSize: showDrillSize(s) ?? "",
    balanceType: s.balanceType ?? "",
    matching: s.matching,
    maxRpm: s.maxRpm === null ? "" : String(s.maxRpm),
    promisedDate: s.promisedDate ?? "",
    rodMaterial: materials.rod,
    pistonMaterial: materials.piston,
  };
}

/** The machinist's settings for this job; the counter may change only the promised date and the state. */
export function JobSettingsForm({ job: initial, role }: { job: Job; role: string }) {
  const router = useRouter();
  const [job, setJob] = useState(initial);
  const [message, setMessage] = useState<{ ok: boolean; lines: string[] } | null>(null);
  const machinist = may({ role }, "edit-balancing-settings");
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(settingsSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: formValues(initial),
  });
  const save = useMutation({
    mutationFn: (body: unknown) =>
      apiFetch<{ job: Job; notices?: string[] }>(`/api/jobs/${job.id}`, { method: "PATCH", body }),
    onSuccess: (answer) => {
      setJob(answer.job);
      form.reset(formValues(answer.job));
      setMessage({ ok: true, lines: ["Saved.", ...(answer.notices ?? [])] });
      router.refresh();
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        for (const [key, text] of Object.entries(e.fields)) {
          const name = key.replace(/^spec\./, "") as FieldName;
          if (name in form.getValues()) form.setError(name, { message: text });
        }
      }
      if (isStaleWrite(e)) return;
      setMessage({
        ok: false,
        lines: [
          e instanceof ApiError
            ? `Not saved: ${Object.values(e.fields)[0] ?? e.message}`
            : "Not saved: the server could not be reached.",
        ],
      });
    },
  });
  const latest = useMutation({
    mutationFn: () => apiFetch<{ job: Job }>(`/api/jobs/${job.id}`),
    onSuccess: (answer) => {
      setJob(answer.job);
      form.reset(formValues(answer.job));
      save.reset();
      setMessage(null);
      router.refresh();
    },
  });

  function submit(v: Parsed) {
    const { rodMaterial, pistonMaterial, oilAllowance, oilAllowancePerRod, ...spec } = v;
    if (oilAllowancePerRod === undefined && job.spec.oilAllowancePerRod !== null) {
      form.setError("oilAllowancePerRod", {
        message: "Oil allowance per rod: enter a number like 2 (0 for none).",
      });
      return;
    }
    // The allowance goes one way: per rod once given, else the job's older per-crankpin figure.
    const oil = oilAllowancePerRod === undefined ? { oilAllowance } : { oilAllowancePerRod };
    const all = {
      ...spec,
      ...oil,
      material: JSON.stringify({ rod: rodMaterial, piston: pistonMaterial }),
    };
    setMessage(null);
    save.mutate({
      version: job.version,
      spec: machinist ? all : { promisedDate: spec.promisedDate ?? null },
    });
  }

  const errors = form.formState.errors;
  const unit = UNIT_WORD[form.watch("massUnit") ?? job.spec.massUnit];
  const lengthUnit = form.watch("lengthUnit") ?? job.spec.lengthUnit;
  const layout = form.watch("layout");
  const noBobweight = !needsBobweight({ layout, bobweightNeeded: job.spec.bobweightNeeded });
  const box = "field-input py-1.5";
  const field = (name: FieldName, label: string, props: Record<string, unknown> = {}) => (
    <label className="text-sm">
      <span className="mb-1 block font-semibold">{label}</span>
      <input
        className={box}
        disabled={!machinist && name !== "promisedDate"}
        aria-invalid={errors[name] ? true : undefined}
        {...props}
        {...form.register(name)}
      />
      {errors[name]?.message ? (
        <span className="text-xs text-replace" data-testid={`error-${name}`}>
          {String(errors[name]?.message)}
        </span>
      ) : null}
    </label>
  );
  const invalid = (): void =>
    setMessage({ ok: false, lines: ["Not saved: check the boxes marked in red."] });
  return (
    <form
      onSubmit={form.handleSubmit(submit, invalid)}
      className="panel grid gap-3 p-4 sm:grid-cols-2 lg:grid-cols-4"
      noValidate
    >
      <h2 className="font-semibold sm:col-span-2 lg:col-span-4">Engine and balancing settings</h2>
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Layout</span>
        <select className={box} disabled={!machinist} {...form.register("layout")}>
          {LAYOUT_PRESETS.filter(
            (p) => !("replacedBy" in p && p.replacedBy) || p.id === job.spec.layout,
          ).map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </select>
      </label>
      {field("cylinders", "Cylinders", { inputMode: "numeric" })}
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Weights in</span>
        <select className={box} disabled={!machinist} {...form.register("massUnit")}>
          <option value="g">grams</option>
          <option value="oz">ounces</option>
        </select>
      </label>
      {field("scaleResolution", `Scale resolution (${unit})`, { inputMode: "decimal" })}
      {field("tolerance", `Tolerance (${unit}): all parts within this of each other`, {
        inputMode: "decimal",
      })}
      {noBobweight ? (
        <div className="text-sm">
          <span className="mb-1 block font-semibold">Balance factor</span>
          <p className="py-1.5 text-graphite-600" data-testid="no-bobweight">
            No bobweight needed: this layout is balanced without bobweights.
          </p>
        </div>
      ) : (
        field("balanceFactor", "Balance factor % (blank: layout default)", {
          inputMode: "decimal",
        })
      )}
      {job.spec.oilAllowancePerRod === null
        ? field("oilAllowance", `Oil allowance per crankpin (${unit}), older setting`, {
            inputMode: "decimal",
          })
        : null}
      {field(
        "oilAllowancePerRod",
        job.spec.oilAllowancePerRod === null
          ? `Oil allowance per rod (${unit}; blank: keep per crankpin)`
          : `Oil allowance per rod (${unit})`,
        { inputMode: "decimal" },
      )}
      {field("maxRpm", "Max service speed (rpm)", { inputMode: "numeric" })}
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Lengths in</span>
        <select className={box} disabled={!machinist} {...form.register("lengthUnit")}>
          <option value="mm">millimetres</option>
          <option value="in">inches</option>
        </select>
      </label>
      {field("bore", `Bore (${lengthUnit}; blank: not known)`, { inputMode: "decimal" })}
      {field("stroke", `Stroke (${lengthUnit}; blank: not known)`, { inputMode: "decimal" })}
      {field("rodLength", `Rod length (${lengthUnit}; blank: not known)`, {
        inputMode: "decimal",
      })}
      {field("drillSize", "Drill for crank work (8.5 mm, 3/8, #21, F; blank: none)")}
      {/* Pistons are milled and rods ground, not drilled, so their material no longer reaches a
          figure; the stored choice is kept and sent back unchanged. */}
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Balance</span>
        <select className={box} disabled={!machinist} {...form.register("balanceType")}>
          <option value="">not noted</option>
          <option value="internal">internal</option>
          <option value="external">external</option>
        </select>
      </label>
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Match the set</span>
        <select className={box} disabled={!machinist} {...form.register("matching")}>
          <option value="by-part">part by part (each kind to its lightest)</option>
          <option value="by-cylinder">by cylinder (whole reciprocating assemblies)</option>
        </select>
      </label>
      {field("scaleName", "Scale used")}
      {field("balancerName", "Balancer used")}
      {field("promisedDate", "Promised for (blank: no date)", { type: "date" })}
      <div className="flex items-start gap-3 sm:col-span-2 lg:col-span-4">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          Save settings
        </button>
        <div
          aria-live="polite"
          data-testid="settings-message"
          className={`text-sm ${message?.ok ? "text-within" : "text-replace"}`}
        >
          {message?.lines.map((line) => (
            <p key={line}>{line}</p>
          ))}
          {isStaleWrite(save.error) ? (
            <ChangedElsewhere
              what="this job's settings"
              error={save.error}
              loading={latest.isPending}
              onReload={() => latest.mutate()}
            >
              {latest.isError ? (
                <span className="block">The server could not be reached; try again.</span>
              ) : null}
            </ChangedElsewhere>
          ) : null}
        </div>
      </div>
    </form>
  );
}

/** Moves the job along: the next state is one click, any state is a choice. */
export function JobStateControl({ job }: { job: Job }) {
  const router = useRouter();
  const next = JOB_STATUSES[JOB_STATUSES.indexOf(job.status) + 1];
  const change = useMutation({
    mutationFn: (status: string) =>
      apiFetch(`/api/jobs/${job.id}`, { method: "PATCH", body: { version: job.version, status } }),
    onSuccess: () => router.refresh(),
  });
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      {next ? (
        <button
          type="button"
          className="btn-primary py-1.5"
          disabled={change.isPending}
          onClick={() => change.mutate(next)}
        >
          Move to “{STATUS_LABEL[next]}”
        </button>
      ) : null}
      <label className="flex items-center gap-1">
        <span className="text-graphite-600">or set</span>
        <select
          className="rounded border border-graphite-300 px-2 py-1"
          value={job.status}
          onChange={(e) => change.mutate(e.target.value)}
          aria-label="Job state"
        >
          {JOB_STATUSES.map((s) => (
            <option key={s} value={s}>
              {STATUS_LABEL[s]}
            </option>
          ))}
        </select>
      </label>
      {isStaleWrite(change.error) ? (
        <ChangedElsewhere
          inline
          what="this job"
          onReload={() => {
            change.reset();
            router.refresh();
          }}
        />
      ) : change.isError ? (
        <span className="text-replace">{change.error.message}</span>
      ) : null}
    </div>
  );
}
