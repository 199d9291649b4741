"use client";

import type { ComponentProps } from "react";
import { formatAngle } from "@/lib/build-record/format";
import {
  type BuildRecordData,
  JOURNAL_KINDS,
  RING_POSITIONS,
  RING_USES,
  type RingPosition,
} from "@/lib/build-record/schemas";
import { recordedLengths, recordedLoads } from "@/lib/build-record/units";
import { RING_WORDS, USE_WORDS } from "./build-settings-form";
import { bindSection, BuildPanel, LabelledCell, typed } from "./cells";
import type { SectionProps } from "./use-build-record";

type Specs = BuildRecordData["specs"];
/** Where a figure sits in the engine's figures: "bore", "cam.intakeOpenBtdc", "clearance.main.min". */
type Path = [string, ...string[]];

const KIND_WORDS = { main: "Main", rod: "Rod" } as const;

function valueAt(specs: Specs, path: Path): string | null {
  let at: unknown = specs;
  for (const key of path) at = (at as Record<string, unknown> | null)?.[key];
  return typeof at === "string" ? at : null;
}

function withValueAt<T>(obj: T, [key, ...rest]: Path, value: string | null): T {
  const o = obj as Record<string, unknown>;
  return {
    ...o,
    [key]: rest.length === 0 ? value : withValueAt(o[key], rest as Path, value),
  } as T;
}

/**
 * The engine's own figures: units, bore and stroke, the ring maker's gap factors (or the shop's
 * table), the cam card, the spring maker's figures, the bearing window and compression figures.
 */
export function EngineFiguresSection(
  props: SectionProps & {
    /** The job's bore as entered and its unit, offered when the finished bore is blank. */
    jobBore: { value: string; unit: "in" | "mm" } | null;
    /** The job's stroke as entered and its unit, offered when the stroke is blank. */
    jobStroke?: { value: string; unit: "in" | "mm" } | null;
  },
) {
  const { editor, results, settings, readOnly, jobBore, jobStroke } = props;
  const b = bindSection(props, "specs");
  const specs = editor.data.specs;
  const unit = specs.lengthUnit;
  const load = specs.loadUnit;
  // A unit switch would misread what is typed (the server refuses it too).
  const lengthsTyped = recordedLengths(editor.data);
  const loadsTyped = recordedLoads(editor.data);
  const setSpecs = (change: (s: Specs) => Specs) => editor.update("specs", change);
  const card = results.card?.ok ? results.card.value : null;
  const cardError = results.card && !results.card.ok ? results.card.refusal.message : null;

  /** One typed figure of the engine's, saved with the section on leaving it. */
  const cell = (
    path: Path,
    label: string,
    unitWord?: string,
    extra: Partial<ComponentProps<typeof LabelledCell>> = {},
  ) => (
    <LabelledCell
      key={path.join(".")}
      label={label}
      unit={unitWord}
      value={valueAt(specs, path)}
      onChange={(v) => setSpecs((s) => withValueAt(s, path, typed(v)))}
      onCommit={b.commit}
      error={b.error(path.join("."))}
      {...extra}
      {...b.ro}
    />
  );

  // ---- the shop's ring table: fill the factors for a maker and use ----
  const makers = Array.from(new Set(settings.ringFactors.map((r) => r.maker)));
  const fillFactors = () => {
    const from = (ring: RingPosition) =>
      settings.ringFactors.find(
        (r) => r.maker === specs.ringMaker && r.use === specs.ringUse && r.position === ring,
      )?.factor ?? null;
    setSpecs((s) => ({
      ...s,
      ringFactors: { top: from("top"), second: from("second"), oil: from("oil") },
    }));
    b.commit();
  };

  return (
    <BuildPanel
      {...b.panel}
      title="The engine's own figures"
      note="From the cam card, the spring, ring and bearing makers and the engine maker's manual."
    >
      <div className="grid gap-x-8 gap-y-2 md:grid-cols-2 xl:grid-cols-3">
        <div className="space-y-2">
          <UnitChoice
            label="Lengths in"
            value={unit}
            choices={[
              ["in", "inches"],
              ["mm", "millimetres"],
            ]}
            locked={lengthsTyped > 0}
            lockedWhy="Lengths are typed in this unit: clear them before changing it"
            readOnly={readOnly}
            onChange={(v) => {
              setSpecs((s) => ({ ...s, lengthUnit: v as Specs["lengthUnit"] }));
              b.commit();
            }}
          />
          <UnitChoice
            label="Spring loads in"
            value={load}
            choices={[
              ["lb", "lb (rate lb/in)"],
              ["N", "N (rate N/mm)"],
            ]}
            locked={loadsTyped > 0}
            lockedWhy="Spring loads are typed in this unit: clear them before changing it"
            readOnly={readOnly}
            onChange={(v) => {
              setSpecs((s) => ({ ...s, loadUnit: v as Specs["loadUnit"] }));
              b.commit();
            }}
          />
          {/* The job's figure is offered in words beside the box (Enter takes it), only when
              the record is in the job's unit: a figure in the other unit would be misread. */}
          {cell(["bore"], "Finished bore", unit, {
            offered: jobBore && jobBore.unit === unit ? jobBore : null,
          })}
          {cell(["stroke"], "Stroke", unit, {
            offered: jobStroke && jobStroke.unit === unit ? jobStroke : null,
          })}
          <h3 className="pt-2 text-sm font-semibold">Rings</h3>
          <label className="flex items-center justify-between gap-2 text-sm">
            <span className="text-graphite-700">Ring maker or set</span>
            <input
              list="ring-makers"
              className="w-40 rounded border border-graphite-300 px-1.5 py-1 text-sm"
              value={specs.ringMaker ?? ""}
              readOnly={readOnly}
              onChange={(e) => setSpecs((s) => ({ ...s, ringMaker: e.target.value || null }))}
              onBlur={b.commit}
            />
            <datalist id="ring-makers">
              {makers.map((m) => (
                <option key={m} value={m} />
              ))}
            </datalist>
          </label>
          <label className="flex items-center justify-between gap-2 text-sm">
            <span className="text-graphite-700">Use</span>
            <select
              className="rounded border border-graphite-300 px-1.5 py-1 text-sm"
              value={specs.ringUse ?? ""}
              disabled={readOnly}
              onChange={(e) => {
                setSpecs((s) => ({ ...s, ringUse: (e.target.value || null) as Specs["ringUse"] }));
                b.commit();
              }}
            >
              <option value="">—</option>
              {RING_USES.map((u) => (
                <option key={u} value={u}>
                  {USE_WORDS[u]}
                </option>
              ))}
            </select>
          </label>
          {!readOnly && makers.length > 0 ? (
            <button
              type="button"
              className="btn-secondary py-1 text-sm"
              disabled={!specs.ringMaker || !specs.ringUse}
              onClick={fillFactors}
            >
              Take the factors from the shop&apos;s table
            </button>
          ) : null}
          {RING_POSITIONS.map((ring) =>
            cell(["ringFactors", ring], `${RING_WORDS[ring]} gap factor`),
          )}
        </div>
        <div className="space-y-2">
          <h3 className="text-sm font-semibold">Cam card (at its checking lift)</h3>
          {(
            [
              ["intakeOpenBtdc", "Intake opens", "° BTDC"],
              ["intakeCloseAbdc", "Intake closes", "° ABDC"],
              ["exhaustOpenBbdc", "Exhaust opens", "° BBDC"],
              ["exhaustCloseAtdc", "Exhaust closes", "° ATDC"],
              ["installCentreline", "Install at intake centreline", "° ATDC"],
            ] as const
          ).map(([key, label, u]) =>
            cell(["cam", key], label, u, {
              inputMode: "text",
              placeholder: key === "installCentreline" && card ? card.intakeCentreline : undefined,
            }),
          )}
          {card ? (
            <p className="text-sm text-graphite-600" data-testid="cam-card-summary">
              Duration {formatAngle(card.intakeDuration)}° intake,{" "}
              {formatAngle(card.exhaustDuration)}° exhaust; intake centreline{" "}
              {formatAngle(card.intakeCentreline)}° ATDC; lobe separation{" "}
              {formatAngle(card.lobeSeparation)}°; ground {formatAngle(card.advance)}° advanced;
              overlap {formatAngle(card.overlap)}°.
            </p>
          ) : cardError ? (
            <p className="text-sm text-replace">{cardError}</p>
          ) : null}
          <h3 className="pt-2 text-sm font-semibold">Valve springs</h3>
          {(
            [
              ["installedHeight", "Installed height", unit],
              ["rate", "Rate", load === "lb" ? "lb/in" : "N/mm"],
              ["solidHeight", "Solid height", unit],
              ["lift", "Valve lift", unit],
              ["seatLoadMin", "Seat load from", load],
              ["seatLoadMax", "Seat load to", load],
            ] as const
          ).map(([key, label, u]) => cell(["spring", key], label, u))}
        </div>
        <div className="space-y-2">
          <h3 className="text-sm font-semibold">Bearing clearance (engine maker)</h3>
          {JOURNAL_KINDS.map((kind) =>
            (["min", "max"] as const).map((end) =>
              cell(
                ["clearance", kind, end],
                `${KIND_WORDS[kind]} clearance ${end === "min" ? "from" : "to"}`,
                unit,
              ),
            ),
          )}
          <h3 className="pt-2 text-sm font-semibold">Compression</h3>
          {(
            [
              ["chamberCc", "Chamber", "cc"],
              ["pistonCc", "Piston dish + / dome −", "cc"],
              ["gasketBore", "Gasket bore", unit],
              ["gasketThickness", "Gasket thickness", unit],
            ] as const
          ).map(([key, label, u]) =>
            cell(["compression", key], label, u, {
              inputMode: key === "pistonCc" ? "text" : "decimal",
            }),
          )}
        </div>
      </div>
    </BuildPanel>
  );
}

/** A unit for the record, locked once figures are typed in it. */
function UnitChoice({
  label,
  value,
  choices,
  locked,
  lockedWhy,
  readOnly,
  onChange,
}: {
  label: string;
  value: string;
  choices: [value: string, words: string][];
  locked: boolean;
  lockedWhy: string;
  readOnly: boolean;
  onChange: (value: string) => void;
}) {
  return (
    <label className="flex items-center justify-between gap-2 text-sm">
      <span className="text-graphite-700">{label}</span>
      <select
        className="rounded border border-graphite-300 px-1.5 py-1 text-sm"
        value={value}
        disabled={readOnly || locked}
        title={locked ? lockedWhy : undefined}
        onChange={(e) => onChange(e.target.value)}
      >
        {choices.map(([v, words]) => (
          <option key={v} value={v}>
            {words}
          </option>
        ))}
      </select>
    </label>
  );
}
