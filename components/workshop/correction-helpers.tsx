"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMutation } from "@tanstack/react-query";
import { type ReactNode, useId } from "react";
import {
  type FieldValues,
  type Path,
  type Resolver,
  type UseFormReturn,
  useForm,
} from "react-hook-form";
import type { z } from "zod";
import type { RotatingPart } from "@/db/schema";
import {
  convertMass,
  DEFAULT_POINT_ANGLE_DEG,
  formatDerivedMass,
  formatLengthIn,
  formatUnbalance,
  MATERIAL_DENSITIES,
  type LengthUnit,
  type MassUnit,
  type MaterialId,
  type MovedCorrection,
  type SplitCorrection,
} from "@/lib/balance";
import { ApiError, apiFetch } from "@/lib/api-client";
import {
  drillHoleSchema,
  moveHoleSchema,
  plugHoleSchema,
  splitHoleSchema,
} from "@/lib/validation/balance";
import type { DrillAnswer, PlugAnswer } from "@/lib/workshop/hole-helpers";
import type { Workshop } from "@/lib/workshop/load";
import { unbalanceIn, unbalanceUnit } from "@/lib/workshop/rotating";

/** Metals a crank, flywheel, clutch cover or damper is made of. */
const PART_METALS: MaterialId[] = ["steel", "ductileIron", "greyCastIron"];
/** Tungsten heavy alloys by ASTM B777 class. */
const HEAVY_METALS: MaterialId[] = [
  "heavyMetalClass1",
  "heavyMetalClass2",
  "heavyMetalClass3",
  "heavyMetalClass4",
];
/** Depth figures: a depth stop reads about 0.1 mm or 0.001 in. */
const DEPTH_STEP: Record<LengthUnit, string> = { mm: "0.1", in: "0.001" };

const WHERE: Record<RotatingPart, string> = {
  crankshaft: "the crank counterweights",
  flywheel: "the flywheel or flexplate",
  clutch: "the clutch cover",
  damper: "the damper",
};

const inputClass = "w-28 rounded border border-graphite-300 px-2 py-1.5 font-mono";

/**
 * On-screen helpers for correcting a crank's counterweights or a flywheel, clutch cover or
 * damper: drill depth for a mass, heavy metal to fit, a correction split over two holes, a
 * correction moved to another radius. Each asks POST /api/balance/hole.
 */
export function CorrectionHelpers({ part, workshop }: { part: RotatingPart; workshop: Workshop }) {
  const spec = workshop.job.spec;
  // Figures are typed in the job's units and the answers (grams, mm) shown in them: computed
  // masses with one decimal more than the job's scale shows (the display rule).
  const massUnit: "g" | "oz" = spec.massUnit === "oz" ? "oz" : "g";
  const lengthUnit: LengthUnit = spec.lengthUnit ?? "mm";
  const units: Units = { mass: massUnit, length: lengthUnit };
  const grams = (v: string) => {
    const negative = v.startsWith("-");
    const shown = convertMass(negative ? v.slice(1) : v, "g", massUnit);
    return `${formatDerivedMass(negative ? `-${shown}` : shown, spec.scaleResolution)} ${massUnit}`;
  };
  return (
    <section className="panel space-y-4 p-4" aria-labelledby={`helpers-${part}`}>
      <div>
        <h3 id={`helpers-${part}`} className="font-semibold">
          Correction helpers for {WHERE[part]}
        </h3>
        <p className="mt-1 rounded border border-amber-300 bg-amber-50 p-2 text-sm text-graphite-800">
          Wear eye protection when drilling or fitting heavy metal. Follow the engine maker&apos;s
          figures and the balancing machine&apos;s instructions; check every depth against the metal
          there is, clear of oil passages, journal fillets and bolt holes. These figures support the
          machinist&apos;s judgement, they do not replace it.
        </p>
      </div>
      <div className="grid gap-4 xl:grid-cols-2">
        <DrillHelper units={units} drillSize={spec.drillSize ?? ""} />
        <PlugHelper units={units} grams={grams} drillSize={spec.drillSize ?? ""} />
        <SplitHelper units={units} grams={grams} />
        <MoveHelper units={units} grams={grams} />
      </div>
    </section>
  );
}

/** A computed mass given in grams, shown in the job's mass unit with its symbol. */
type Grams = (value: string) => string;
/** The job's units: what the helpers' boxes are typed in. */
type Units = { mass: Extract<MassUnit, "g" | "oz">; length: LengthUnit };

/** A helper's form: the shared zod schema on the client, the same route on the server. */
function useHelper<S extends z.ZodType<FieldValues>, A>(schema: S, defaults: z.input<S>) {
  type V = z.input<S>;
  const form = useForm<V & FieldValues, unknown, z.output<S>>({
    resolver: zodResolver(schema as never) as unknown as Resolver<
      V & FieldValues,
      unknown,
      z.output<S>
    >,
    defaultValues: defaults as never,
  });
  const ask = useMutation({
    mutationFn: (body: z.output<S>) => apiFetch<A>("/api/balance/hole", { method: "POST", body }),
    onError: (error) => {
      if (!(error instanceof ApiError)) return;
      for (const [field, message] of Object.entries(error.fields))
        form.setError(field as Path<V & FieldValues>, { message });
    },
  });
  const submit = form.handleSubmit((values) => ask.mutate(values));
  return { form, ask, submit };
}

function Field<V extends FieldValues>({
  form,
  name,
  label,
  hint,
  wide,
}: {
  form: UseFormReturn<V, unknown, unknown>;
  name: Path<V>;
  label: string;
  hint?: string;
  wide?: boolean;
}) {
  const id = useId();
  const error = form.formState.errors[name]?.message;
  return (
    <div className="text-sm">
      <label htmlFor={id} className="block font-semibold">
        {label}
      </label>
      <input
        id={id}
        className={wide ? inputClass.replace("w-28", "w-36") : inputClass}
        inputMode={wide ? "text" : "decimal"}
        aria-invalid={error ? true : undefined}
        aria-describedby={
          [hint ? `${id}-hint` : "", typeof error === "string" ? `${id}-error` : ""]
            .filter(Boolean)
            .join(" ") || undefined
        }
        {...form.register(name)}
      />
      {hint ? (
        <span id={`${id}-hint`} className="block text-xs text-graphite-500">
          {hint}
        </span>
      ) : null}
      {typeof error === "string" ? (
        <span id={`${id}-error`} className="block max-w-56 text-xs text-replace">
          {error}
        </span>
      ) : null}
    </div>
  );
}

function HelperCard({
  title,
  onSubmit,
  pending,
  children,
  answer,
  failure,
  testId,
}: {
  title: string;
  onSubmit: () => void;
  pending: boolean;
  children: ReactNode;
  answer: ReactNode;
  failure: string | null;
  testId: string;
}) {
  return (
    <form
      className="min-w-0 rounded border border-graphite-200 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit();
      }}
      noValidate
      data-testid={testId}
    >
      <h4 className="font-semibold">{title}</h4>
      <div className="mt-2 flex flex-wrap items-start gap-3">{children}</div>
      <button type="submit" className="btn-secondary mt-2 py-1" disabled={pending}>
        {pending ? "Working…" : "Work it out"}
      </button>
      <div aria-live="polite" className="mt-2 text-sm">
        {failure ? <p className="text-replace">{failure}</p> : answer}
      </div>
    </form>
  );
}

function failureOf(error: Error | null): string | null {
  if (!error) return null;
  return error instanceof ApiError && error.status === 422
    ? "Not worked out: see the marked box."
    : error.message;
}

function MaterialSelect({
  label,
  choices,
  onPick,
}: {
  label: string;
  choices: MaterialId[];
  onPick: (density: string) => void;
}) {
  return (
    <label className="max-w-full min-w-0 text-sm">
      <span className="block font-semibold">{label}</span>
      <select
        className="max-w-full rounded border border-graphite-300 px-2 py-1.5"
        defaultValue={choices[0]}
        onChange={(e) => onPick(MATERIAL_DENSITIES[e.target.value as MaterialId].density)}
      >
        {choices.map((id) => (
          <option key={id} value={id}>
            {MATERIAL_DENSITIES[id].label} ({MATERIAL_DENSITIES[id].density} g/cm³)
          </option>
        ))}
      </select>
    </label>
  );
}

function DrillHelper({ units, drillSize }: { units: Units; drillSize: string }) {
  const lengthUnit = units.length;
  const { form, ask, submit } = useHelper<typeof drillHoleSchema, DrillAnswer>(drillHoleSchema, {
    kind: "drill",
    massUnit: units.mass,
    lengthUnit: units.length,
    mass: "",
    diameter: drillSize,
    density: MATERIAL_DENSITIES.steel.density,
    pointAngle: DEFAULT_POINT_ANGLE_DEG,
    availableDepth: undefined,
  });
  const a = ask.data;
  // Depths in the unit the drill was given in (or the job's), the other unit beside it.
  const unit: LengthUnit = a?.drill.unit === "in" || lengthUnit === "in" ? "in" : "mm";
  const other: LengthUnit = unit === "in" ? "mm" : "in";
  const depth = (mm: string) =>
    `${formatLengthIn(mm, unit, DEPTH_STEP[unit])} (${formatLengthIn(mm, other, DEPTH_STEP[other])})`;
  return (
    <HelperCard
      title="Drill depth for a mass"
      testId="helper-drill"
      onSubmit={submit}
      pending={ask.isPending}
      failure={failureOf(ask.error)}
      answer={
        a ? (
          <div className="space-y-1">
            <p className="font-semibold">
              Drill {a.drill.entered} ({formatLengthIn(a.drill.diameterMm, "mm", "0.01")}) to{" "}
              {depth(a.tipDepth)} at the tip to take out {ask.variables?.mass} {units.mass}.
            </p>
            <p className="text-graphite-600">
              {a.shallow
                ? "Only the point cuts: the hole never reaches full diameter."
                : `Full diameter for ${depth(a.fullDiameterDepth)}; the ${a.pointAngle}° point adds ${depth(a.coneLength)}.`}{" "}
              Depth measured from where the tip first cuts.
            </p>
            {a.fits === false ? (
              <p className="font-semibold text-replace">
                Deeper than the {depth(a.availableDepth!)} of metal there is: use a larger drill or
                split it over two holes.
              </p>
            ) : a.fits ? (
              <p className="text-within">
                Within the {depth(a.availableDepth!)} of metal there is.
              </p>
            ) : null}
          </div>
        ) : null
      }
    >
      <Field form={form} name="mass" label={`Mass to take out (${units.mass})`} />
      <Field form={form} name="diameter" label="Drill size" hint='8.5 mm, 3/8", #21 or F' wide />
      <MaterialSelect
        label="Metal"
        choices={PART_METALS}
        onPick={(d) => form.setValue("density", d)}
      />
      <Field form={form} name="density" label="Density (g/cm³)" />
      <Field form={form} name="pointAngle" label="Point angle (°)" />
      <Field
        form={form}
        name="availableDepth"
        label={`Metal there is (${units.length}, optional)`}
        hint="depth before breaking through"
      />
    </HelperCard>
  );
}

function PlugHelper({
  units,
  grams,
  drillSize,
}: {
  units: Units;
  grams: Grams;
  drillSize: string;
}) {
  const { form, ask, submit } = useHelper<typeof plugHoleSchema, PlugAnswer>(plugHoleSchema, {
    kind: "plug",
    lengthUnit: units.length,
    diameter: drillSize,
    length: "",
    plugDensity: MATERIAL_DENSITIES.heavyMetalClass3.density,
    hostDensity: MATERIAL_DENSITIES.steel.density,
    pointAngle: DEFAULT_POINT_ANGLE_DEG,
  });
  const a = ask.data;
  return (
    <HelperCard
      title="Heavy metal to add"
      testId="helper-plug"
      onSubmit={submit}
      pending={ask.isPending}
      failure={failureOf(ask.error)}
      answer={
        a ? (
          <div className="space-y-1">
            <p className="font-semibold">
              A {a.drill.entered} plug adds {grams(a.netMass)} to the part.
            </p>
            <p className="text-graphite-600">
              Plug {grams(a.plugMass)}, less {grams(a.removedMass)} drilled out
              {a.pointVoidMass
                ? `, of which ${grams(a.pointVoidMass)} is the ${a.pointAngle}° point's cone left empty under a flat-ended plug`
                : ""}
              . Use the density on the supplier&apos;s certificate where you have it.
            </p>
          </div>
        ) : null
      }
    >
      <Field form={form} name="diameter" label="Plug size" hint='12.7 mm or 1/2"' wide />
      <Field form={form} name="length" label={`Plug length (${units.length})`} />
      <MaterialSelect
        label="Heavy metal (ASTM B777)"
        choices={HEAVY_METALS}
        onPick={(d) => form.setValue("plugDensity", d)}
      />
      <Field form={form} name="plugDensity" label="Plug density (g/cm³)" />
      <MaterialSelect
        label="Part metal"
        choices={PART_METALS}
        onPick={(d) => form.setValue("hostDensity", d)}
      />
      <Field form={form} name="hostDensity" label="Part density (g/cm³)" />
      <Field
        form={form}
        name="pointAngle"
        label="Drill point (°)"
        hint="leave empty for a flat-bottomed hole"
      />
    </HelperCard>
  );
}

function SplitHelper({ units, grams }: { units: Units; grams: Grams }) {
  const { form, ask, submit } = useHelper<typeof splitHoleSchema, SplitCorrection>(
    splitHoleSchema,
    { kind: "split", massUnit: units.mass, mass: "", halfAngleDeg: "" },
  );
  const a = ask.data;
  return (
    <HelperCard
      title="Split over two holes"
      testId="helper-split"
      onSubmit={submit}
      pending={ask.isPending}
      failure={failureOf(ask.error)}
      answer={
        a ? (
          <p>
            <span className="font-semibold">{grams(a.massEach)} in each hole</span> at ±
            {a.halfAngleDeg}° from the wanted angle ({grams(a.totalMass)} in both): each hole needs
            m / (2 cos θ).
          </p>
        ) : null
      }
    >
      <Field form={form} name="mass" label={`Correction wanted (${units.mass})`} />
      <Field form={form} name="halfAngleDeg" label="Each hole off the angle (°)" hint="below 90" />
    </HelperCard>
  );
}

function MoveHelper({ units, grams }: { units: Units; grams: Grams }) {
  const { form, ask, submit } = useHelper<typeof moveHoleSchema, MovedCorrection>(moveHoleSchema, {
    kind: "move",
    massUnit: units.mass,
    lengthUnit: units.length,
    mass: "",
    fromRadius: "",
    toRadius: "",
  });
  const a = ask.data;
  return (
    <HelperCard
      title="Move to another radius"
      testId="helper-move"
      onSubmit={submit}
      pending={ask.isPending}
      failure={failureOf(ask.error)}
      answer={
        a ? (
          <p>
            <span className="font-semibold">
              {grams(a.mass)} at {ask.variables?.toRadius} {units.length}
            </span>{" "}
            does the same as {ask.variables?.mass} {units.mass} at {ask.variables?.fromRadius}{" "}
            {units.length} ({formatUnbalance(unbalanceIn(a.unbalance, units))}{" "}
            {unbalanceUnit(units)}).
          </p>
        ) : null
      }
    >
      <Field form={form} name="mass" label={`Mass (${units.mass})`} />
      <Field
        form={form}
        name="fromRadius"
        label={`At radius (${units.length})`}
        hint="e.g. the balancer's"
      />
      <Field
        form={form}
        name="toRadius"
        label={`Wanted radius (${units.length})`}
        hint="where you can drill"
      />
    </HelperCard>
  );
}
