"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import { z } from "zod";
import type { Job } from "@/db/jobs";
import { JOB_STATUSES } from "@/db/schema";
import { LAYOUT_PRESETS, MATERIAL_DENSITIES } from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import { jobSpecSchema } from "@/lib/validation/workshop";
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
    drillDiameterMm: true,
    balanceType: true,
    maxRpm: true,
    promisedDate: true,
  })
  .extend({ rodMaterial: z.string(), pistonMaterial: z.string() });
type Values = z.input<typeof settingsSchema>;
type Parsed = z.output<typeof settingsSchema>;

const blank = (v: string | null | undefined) => (v === "" || v === undefined ? null : v);

/** The machinist's settings for this job; the counter may change only the promised date and the state. */
export function JobSettingsForm({ job, role }: { job: Job; role: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const machinist = role === "machinist" || role === "owner";
  const materials = parseDrillMaterials(job.spec.material);
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(settingsSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: {
      layout: job.spec.layout ?? "custom",
      cylinders: job.spec.cylinders ?? 1,
      massUnit: job.spec.massUnit,
      scaleResolution: job.spec.scaleResolution,
      scaleName: job.spec.scaleName ?? "",
      balancerName: job.spec.balancerName ?? "",
      tolerance: job.spec.tolerance,
      balanceFactor: job.spec.balanceFactor ?? "",
      oilAllowance: job.spec.oilAllowance,
      drillDiameterMm: job.spec.drillDiameterMm ?? "",
      balanceType: job.spec.balanceType,
      maxRpm: job.spec.maxRpm,
      promisedDate: job.spec.promisedDate ?? "",
      rodMaterial: materials.rod,
      pistonMaterial: materials.piston,
    },
  });
  const save = useMutation({
    mutationFn: (body: unknown) =>
      apiFetch<{ job: Job }>(`/api/jobs/${job.id}`, { method: "PATCH", body }),
    onSuccess: () => {
      setMessage({ ok: true, text: "Saved." });
      router.refresh();
    },
    onError: (e) =>
      setMessage({
        ok: false,
        text:
          e instanceof ApiError && e.status === 409
            ? "Someone changed this job meanwhile. Reload the page to see their changes, then save again."
            : e instanceof ApiError
              ? (Object.values(e.fields)[0] ?? e.message)
              : "Not saved: the server could not be reached.",
      }),
  });

  function submit(v: Parsed) {
    const { rodMaterial, pistonMaterial, ...spec } = v;
    const cleaned = {
      ...spec,
      balanceFactor: blank(spec.balanceFactor),
      drillDiameterMm: blank(spec.drillDiameterMm),
      scaleName: blank(spec.scaleName),
      balancerName: blank(spec.balancerName),
      promisedDate: blank(spec.promisedDate),
      material: JSON.stringify({ rod: rodMaterial, piston: pistonMaterial }),
    };
    save.mutate({
      version: job.version,
      spec: machinist ? cleaned : { promisedDate: cleaned.promisedDate },
    });
  }

  const errors = form.formState.errors;
  const box = "field-input py-1.5";
  const field = (name: keyof Values, label: string, props: Record<string, unknown> = {}) => (
    <label className="text-sm">
      <span className="mb-1 block font-semibold">{label}</span>
      <input
        className={box}
        disabled={!machinist && name !== "promisedDate"}
        {...props}
        {...form.register(name)}
      />
      {errors[name]?.message ? (
        <span className="text-xs text-replace">{String(errors[name]?.message)}</span>
      ) : null}
    </label>
  );
  return (
    <form
      onSubmit={form.handleSubmit(submit)}
      className="panel grid gap-3 p-4 sm:grid-cols-2 lg:grid-cols-4"
      noValidate
    >
      <h2 className="font-semibold sm:col-span-2 lg:col-span-4">Engine and balancing settings</h2>
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Layout</span>
        <select className={box} disabled={!machinist} {...form.register("layout")}>
          {LAYOUT_PRESETS.map((p) => (
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
      {field("scaleResolution", "Scale resolution", { inputMode: "decimal" })}
      {field("tolerance", "Tolerance (finished spread)", { inputMode: "decimal" })}
      {field("balanceFactor", "Balance factor % (blank: layout default)", { inputMode: "decimal" })}
      {field("oilAllowance", "Oil allowance per crankpin", { inputMode: "decimal" })}
      {field("maxRpm", "Max service speed (rpm)", { inputMode: "numeric" })}
      {field("drillDiameterMm", "Drill diameter (mm)", { inputMode: "decimal" })}
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Rods are</span>
        <select className={box} disabled={!machinist} {...form.register("rodMaterial")}>
          {Object.entries(MATERIAL_DENSITIES).map(([id, m]) => (
            <option key={id} value={id}>
              {m.label} ({m.density} g/cm³)
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Pistons are</span>
        <select className={box} disabled={!machinist} {...form.register("pistonMaterial")}>
          {Object.entries(MATERIAL_DENSITIES).map(([id, m]) => (
            <option key={id} value={id}>
              {m.label} ({m.density} g/cm³)
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm">
        <span className="mb-1 block font-semibold">Balance</span>
        <select
          className={box}
          disabled={!machinist}
          {...form.register("balanceType", { setValueAs: (v) => (v === "" ? null : v) })}
        >
          <option value="">not noted</option>
          <option value="internal">internal</option>
          <option value="external">external</option>
        </select>
      </label>
      {field("scaleName", "Scale used")}
      {field("balancerName", "Balancer used")}
      {field("promisedDate", "Promised for", { type: "date" })}
      <div className="flex items-center gap-3 sm:col-span-2 lg:col-span-4">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          Save settings
        </button>
        <span
          aria-live="polite"
          className={`text-sm ${message?.ok ? "text-within" : "text-replace"}`}
        >
          {message?.text}
        </span>
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
      {change.isError ? <span className="text-replace">{change.error.message}</span> : null}
    </div>
  );
}
