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

/** One box of a helper: a figure typed in, or a choice of metal that fills a density box. */
type HelperInput<V> =
  | { name: Path<V & FieldValues>; label: string; hint?: string; wide?: boolean }
  | { metal: string; choices: MaterialId[]; fills: Path<V & FieldValues> };

/**
 * One correction helper: its boxes (from a list), "Work it out", and the answer. The shared zod
 * schema checks the boxes here and the same route (POST /api/balance/hole) on the server.
 */
function HelperForm<S extends z.ZodType<FieldValues>, A>({
  title,
  testId,
  schema,
  defaults,
  inputs,
  answer,
}: {
  title: string;
  testId: string;
  schema: S;
  defaults: z.input<S>;
  inputs: HelperInput<z.input<S>>[];
  /** What the answer says, given the figures that were asked. */
  answer: (answer: A, asked: z.output<S>) => ReactNode;
}) {
  type V = z.input<S> & FieldValues;
  const form = useForm<V, unknown, z.output<S>>({
    resolver: zodResolver(schema as never) as unknown as Resolver<V, unknown, z.output<S>>,
    defaultValues: defaults as never,
  });
  const ask = useMutation({
    mutationFn: (body: z.output<S>) => apiFetch<A>("/api/balance/hole", { method: "POST", body }),
    onError: (error) => {
      if (!(error instanceof ApiError)) return;
      for (const [field, message] of Object.entries(error.fields))
        form.setError(field as Path<V>, { message });
    },
  });
  const failure = failureOf(ask.error);
  return (
    <form
      className="min-w-0 rounded border border-graphite-200 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        void form.handleSubmit((values) => ask.mutate(values))();
      }}
      noValidate
      data-testid={testId}
    >
      <h4 className="font-semibold">{title}</h4>
      <div className="mt-2 flex flex-wrap items-start gap-3">
        {inputs.map((input) =>
          "metal" in input ? (
            <MaterialSelect
              key={`metal-${input.fills}`}
              label={input.metal}
              choices={input.choices}
              onPick={(d) => form.setValue(input.fills, d as never)}
            />
          ) : (
            <Field key={input.name} form={form} {...input} />
          ),
        )}
      </div>
      <button type="submit" className="btn-secondary mt-2 py-1" disabled={ask.isPending}>
        {ask.isPending ? "Working…" : "Work it out"}
      </button>
      <div aria-live="polite" className="mt-2 text-sm">
        {failure ? (
          <p className="text-replace">{failure}</p>
        ) : ask.data && ask.variables ? (
          answer(ask.data, ask.variables)
        ) : null}
      </div>
    </form>
  );
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
  return (
    <HelperForm<typeof drillHoleSchema, DrillAnswer>
      title="Drill depth for a mass"
      testId="helper-drill"
      schema={drillHoleSchema}
      defaults={{
        kind: "drill",
        massUnit: units.mass,
        lengthUnit: units.length,
        mass: "",
        diameter: drillSize,
        density: MATERIAL_DENSITIES.steel.density,
        pointAngle: DEFAULT_POINT_ANGLE_DEG,
        availableDepth: undefined,
      }}
      inputs={[
        { name: "mass", label: `Mass to take out (${units.mass})` },
        { name: "diameter", label: "Drill size", hint: '8.5 mm, 3/8", #21 or F', wide: true },
        { metal: "Metal", choices: PART_METALS, fills: "density" },
        { name: "density", label: "Density (g/cm³)" },
        { name: "pointAngle", label: "Point angle (°)" },
        {
          name: "availableDepth",
          label: `Metal there is (${units.length}, optional)`,
          hint: "depth before breaking through",
        },
      ]}
      answer={(a, asked) => {
        // Depths in the unit the drill was given in (or the job's), the other unit beside it.
        const unit: LengthUnit = a.drill.unit === "in" || units.length === "in" ? "in" : "mm";
        const other: LengthUnit = unit === "in" ? "mm" : "in";
        const depth = (mm: string) =>
          `${formatLengthIn(mm, unit, DEPTH_STEP[unit])} (${formatLengthIn(mm, other, DEPTH_STEP[other])})`;
        return (
          <div className="space-y-1">
            <p className="font-semibold">
              Drill {a.drill.entered} ({formatLengthIn(a.drill.diameterMm, "mm", "0.01")}) to{" "}
              {depth(a.tipDepth)} at the tip to take out {asked.mass} {units.mass}.
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
        );
      }}
    />
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
  return (
    <HelperForm<typeof plugHoleSchema, PlugAnswer>
      title="Heavy metal to add"
      testId="helper-plug"
      schema={plugHoleSchema}
      defaults={{
        kind: "plug",
        lengthUnit: units.length,
        diameter: drillSize,
        length: "",
        plugDensity: MATERIAL_DENSITIES.heavyMetalClass3.density,
        hostDensity: MATERIAL_DENSITIES.steel.density,
        pointAngle: DEFAULT_POINT_ANGLE_DEG,
      }}
      inputs={[
        { name: "diameter", label: "Plug size", hint: '12.7 mm or 1/2"', wide: true },
        { name: "length", label: `Plug length (${units.length})` },
        { metal: "Heavy metal (ASTM B777)", choices: HEAVY_METALS, fills: "plugDensity" },
        { name: "plugDensity", label: "Plug density (g/cm³)" },
        { metal: "Part metal", choices: PART_METALS, fills: "hostDensity" },
        { name: "hostDensity", label: "Part density (g/cm³)" },
        {
          name: "pointAngle",
          label: "Drill point (°)",
          hint: "leave empty for a flat-bottomed hole",
        },
      ]}
      answer={(a) => (
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
      )}
    />
  );
}

function SplitHelper({ units, grams }: { units: Units; grams: Grams }) {
  return (
    <HelperForm<typeof splitHoleSchema, SplitCorrection>
      title="Split over two holes"
      testId="helper-split"
      schema={splitHoleSchema}
      defaults={{ kind: "split", massUnit: units.mass, mass: "", halfAngleDeg: "" }}
      inputs={[
        { name: "mass", label: `Correction wanted (${units.mass})` },
        { name: "halfAngleDeg", label: "Each hole off the angle (°)", hint: "below 90" },
      ]}
      answer={(a) => (
        <p>
          <span className="font-semibold">{grams(a.massEach)} in each hole</span> at ±
          {a.halfAngleDeg}° from the wanted angle ({grams(a.totalMass)} in both): each hole needs m
          / (2 cos θ).
        </p>
      )}
    />
  );
}

function MoveHelper({ units, grams }: { units: Units; grams: Grams }) {
  return (
    <HelperForm<typeof moveHoleSchema, MovedCorrection>
      title="Move to another radius"
      testId="helper-move"
      schema={moveHoleSchema}
      defaults={{
        kind: "move",
        massUnit: units.mass,
        lengthUnit: units.length,
        mass: "",
        fromRadius: "",
        toRadius: "",
      }}
      inputs={[
        { name: "mass", label: `Mass (${units.mass})` },
        { name: "fromRadius", label: `At radius (${units.length})`, hint: "e.g. the balancer's" },
        { name: "toRadius", label: `Wanted radius (${units.length})`, hint: "where you can drill" },
      ]}
      answer={(a, asked) => (
        <p>
          <span className="font-semibold">
            {grams(a.mass)} at {asked.toRadius} {units.length}
          </span>{" "}
          does the same as {asked.mass} {units.mass} at {asked.fromRadius} {units.length} (
          {formatUnbalance(unbalanceIn(a.unbalance, units))} {unbalanceUnit(units)}).
        </p>
      )}
    />
  );
}
