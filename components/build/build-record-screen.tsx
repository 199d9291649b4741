"use client";

import { type KeyboardEvent, useMemo, useState } from "react";
import { ringEndGap } from "@/lib/assembly";
import { evaluateBuildRecord } from "@/lib/build-record/evaluate";
import {
  decimalsOf,
  formatAngle,
  formatCc,
  formatDerivedLength,
  formatLengthAsTyped,
  formatLoad,
  formatPerUnit,
  formatRatio,
} from "@/lib/build-record/format";
import type { BuildRecordView } from "@/lib/build-record/record";
import {
  type BuildRecordData,
  JOURNAL_KINDS,
  RING_POSITIONS,
  RING_USES,
  type RingPosition,
  VALVES,
} from "@/lib/build-record/schemas";
import { recordedLengths, recordedLoads } from "@/lib/build-record/units";
import { BuildPanel, Cell, fieldError, LabelledCell } from "./cells";
import { RING_WORDS, USE_WORDS } from "./build-settings-form";
import { useBuildRecord } from "./use-build-record";

/** Blank is "not given"; a leading point gets its zero, as the server keeps it. */
const typed = (v: string): string | null => {
  const t = v.trim();
  return t === "" ? null : t.replace(/^(-?)\./, "$10.");
};

const VALVE_WORDS = { intake: "Intake", exhaust: "Exhaust" } as const;
const KIND_WORDS = { main: "Main", rod: "Rod" } as const;
const STATUS_CLASS: Record<string, string> = {
  ok: "text-within",
  tight: "text-machine",
  wide: "text-replace",
  interference: "text-replace",
};

/** Enter moves to the next figure (Shift+Enter back), at once; leaving a box saves it. */
function moveOnEnter(e: KeyboardEvent<HTMLDivElement>) {
  const target = e.target as HTMLElement;
  if (e.key !== "Enter" || !target.matches("input[data-cell]")) return;
  e.preventDefault();
  const cells = Array.from(
    e.currentTarget.querySelectorAll<HTMLInputElement>("input[data-cell]:not([readonly])"),
  );
  const at = cells.indexOf(target as HTMLInputElement);
  const next = cells[at + (e.shiftKey ? -1 : 1)];
  if (next) {
    next.focus();
    next.select();
  } else (target as HTMLInputElement).blur();
}

/**
 * The engine build record of a job, keyboard first: the engine's own figures, ring gaps, TDC,
 * cam checks, valve springs, bearing clearances, deck and compression. Every figure shown is
 * worked out by the same function the server checks with (lib/build-record/evaluate.ts).
 */
export function BuildRecordScreen({
  initial,
  cylinders,
  readOnly,
  jobBore,
}: {
  initial: BuildRecordView;
  cylinders: number;
  readOnly: boolean;
  /** The job's bore as entered and its unit, offered when the finished bore is blank. */
  jobBore: { value: string; unit: "in" | "mm" } | null;
}) {
  const { data, update, save, state, resolveStale } = useBuildRecord(initial);
  const settings = initial.settings;
  const results = useMemo(() => evaluateBuildRecord(data, settings), [data, settings]);
  const specs = data.specs;
  const unit = specs.lengthUnit;
  const load = specs.loadUnit;
  const cyls = Array.from({ length: cylinders }, (_, i) => i + 1);
  // A unit switch would misread what is typed (the server refuses it too).
  const lengthsTyped = recordedLengths(data);
  const loadsTyped = recordedLoads(data);
  const ro = readOnly ? { readOnly: true } : {};

  const setSpecs = (change: (s: BuildRecordData["specs"]) => BuildRecordData["specs"]) =>
    update("specs", change);
  const commit = (section: Parameters<typeof save>[0]) => () => {
    if (!readOnly) void save(section);
  };

  // ---- ring gaps: one row per cylinder and ring; a new figure is a new reading ----
  const [ringDrafts, setRingDrafts] = useState<Record<string, string>>({});
  const ringIndex = (c: number, ring: RingPosition) =>
    data.rings.rows.findIndex((r) => r.cylinder === c && r.ring === ring);
  const commitRing = (c: number, ring: RingPosition) => {
    const key = `${c}:${ring}`;
    const draft = ringDrafts[key];
    if (draft === undefined) return;
    setRingDrafts(({ [key]: _gone, ...rest }) => rest);
    const value = typed(draft);
    update("rings", (rings) => {
      const rows = [...rings.rows];
      const i = rows.findIndex((r) => r.cylinder === c && r.ring === ring);
      const row = i >= 0 ? rows[i]! : { cylinder: c, ring, readings: [], done: false };
      const last = row.readings.at(-1) ?? null;
      if (value === last) return rings;
      // A new figure is a new reading (the earlier ones are kept); a cleared box takes back
      // the last one (a typing slip).
      const readings = value === null ? row.readings.slice(0, -1) : [...row.readings, value];
      const next = { ...row, readings, done: value === null ? false : row.done };
      if (i >= 0) rows[i] = next;
      else rows.push(next);
      return { rows: rows.filter((r) => r.readings.length > 0 || r.done) };
    });
    void save("rings");
  };
  const setRingDone = (c: number, ring: RingPosition, done: boolean) => {
    update("rings", (rings) => ({
      rows: rings.rows.map((r) => (r.cylinder === c && r.ring === ring ? { ...r, done } : r)),
    }));
    void save("rings");
  };

  const targetOnly = (factor: string | null): string | null => {
    if (!specs.bore || !factor) return null;
    try {
      return ringEndGap({ bore: specs.bore, factor }).target;
    } catch {
      return null; // the refusal shows once a gap is measured
    }
  };

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
    void save("specs");
  };

  // ---- springs, clearances, deck: a row per part, made when a figure is typed ----
  type SpringRow = BuildRecordData["springs"]["rows"][number];
  const springRow = (c: number, valve: SpringRow["valve"]) =>
    data.springs.rows.find((r) => r.cylinder === c && r.valve === valve);
  const setSpring = (c: number, valve: SpringRow["valve"], change: Partial<SpringRow>) =>
    update("springs", (s) => {
      const rows = [...s.rows];
      const i = rows.findIndex((r) => r.cylinder === c && r.valve === valve);
      const base: SpringRow =
        i >= 0
          ? rows[i]!
          : { cylinder: c, valve, installedHeight: null, shim: null, seatLoad: null };
      const next = { ...base, ...change };
      if (i >= 0) rows[i] = next;
      else rows.push(next);
      return { rows: rows.filter((r) => r.installedHeight || r.shim || r.seatLoad) };
    });

  type ClearanceRow = BuildRecordData["clearances"]["rows"][number];
  const storedMains = Math.max(
    0,
    ...data.clearances.rows.filter((r) => r.kind === "main").map((r) => r.journal),
  );
  const [mains, setMains] = useState(Math.max(storedMains, 5));
  const journals = [
    ...Array.from({ length: mains }, (_, i) => ({ kind: "main" as const, journal: i + 1 })),
    ...cyls.map((c) => ({ kind: "rod" as const, journal: c })),
  ];
  const clearanceRow = (kind: ClearanceRow["kind"], journal: number) =>
    data.clearances.rows.find((r) => r.kind === kind && r.journal === journal);
  const setReading = (
    kind: ClearanceRow["kind"],
    journal: number,
    part: "bore" | "journalDiameter",
    p: number,
    d: number,
    value: string | null,
  ) =>
    update("clearances", (s) => {
      const rows = [...s.rows];
      const i = rows.findIndex((r) => r.kind === kind && r.journal === journal);
      const empty = () => [
        [null, null],
        [null, null],
      ];
      const base: ClearanceRow =
        i >= 0 ? rows[i]! : { kind, journal, bore: empty(), journalDiameter: empty() };
      const grid = [0, 1].map((pp) => [0, 1].map((dd) => base[part][pp]?.[dd] ?? null));
      grid[p]![d] = value;
      const next = { ...base, [part]: grid };
      if (i >= 0) rows[i] = next;
      else rows.push(next);
      return {
        rows: rows.filter((r) => [...r.bore.flat(), ...r.journalDiameter.flat()].some((v) => v)),
      };
    });

  type DeckRow = BuildRecordData["deck"]["rows"][number];
  const deckRow = (c: number) => data.deck.rows.find((r) => r.cylinder === c);
  const setDeck = (c: number, change: Partial<DeckRow>) =>
    update("deck", (s) => {
      const rows = [...s.rows];
      const i = rows.findIndex((r) => r.cylinder === c);
      const base: DeckRow =
        i >= 0 ? rows[i]! : { cylinder: c, deckClearance: null, chamberCc: null };
      const next = { ...base, ...change };
      if (i >= 0) rows[i] = next;
      else rows.push(next);
      return { rows: rows.filter((r) => r.deckClearance || r.chamberCc) };
    });

  const resolve = (section: Parameters<typeof save>[0]) => (keep: "theirs" | "mine") =>
    void resolveStale(section, keep);

  const card = results.card?.ok ? results.card.value : null;
  const cardError = results.card && !results.card.ok ? results.card.refusal.message : null;

  return (
    <div className="space-y-6" onKeyDown={moveOnEnter}>
      <p className="rounded border border-brass-300 bg-brass-50 p-3 text-sm text-brass-700">
        Torque figures, clearances, gaps and spring loads are the engine maker&apos;s and the parts
        makers&apos; to give: this record keeps what was measured and works out what follows from
        it; it supports the builder&apos;s judgement and does not replace it. Turn the engine by
        hand with a piston stop fitted, never on the starter.
      </p>
      {readOnly ? (
        <p className="text-sm text-graphite-600">
          Read only: the machinist and the owner keep this record.
        </p>
      ) : (
        <p className="text-sm text-graphite-600">
          Type a figure and press Enter to move on (Shift+Enter goes back); leaving a box saves it.
          Lengths in {unit === "in" ? "inches" : "millimetres"}, shown as typed.
        </p>
      )}

      <BuildPanel
        section="specs"
        title="The engine's own figures"
        state={state.specs}
        onResolve={resolve("specs")}
        note="From the cam card, the spring, ring and bearing makers and the engine maker's manual."
      >
        <div className="grid gap-x-8 gap-y-2 md:grid-cols-2 xl:grid-cols-3">
          <div className="space-y-2">
            <label className="flex items-center justify-between gap-2 text-sm">
              <span className="text-graphite-700">Lengths in</span>
              <select
                className="rounded border border-graphite-300 px-1.5 py-1 text-sm"
                value={unit}
                disabled={readOnly || lengthsTyped > 0}
                title={
                  lengthsTyped > 0
                    ? "Lengths are typed in this unit: clear them before changing it"
                    : undefined
                }
                onChange={(e) => {
                  setSpecs((s) => ({ ...s, lengthUnit: e.target.value as "in" | "mm" }));
                  void save("specs");
                }}
              >
                <option value="in">inches</option>
                <option value="mm">millimetres</option>
              </select>
            </label>
            <label className="flex items-center justify-between gap-2 text-sm">
              <span className="text-graphite-700">Spring loads in</span>
              <select
                className="rounded border border-graphite-300 px-1.5 py-1 text-sm"
                value={load}
                disabled={readOnly || loadsTyped > 0}
                title={
                  loadsTyped > 0
                    ? "Spring loads are typed in this unit: clear them before changing it"
                    : undefined
                }
                onChange={(e) => {
                  setSpecs((s) => ({ ...s, loadUnit: e.target.value as "lb" | "N" }));
                  void save("specs");
                }}
              >
                <option value="lb">lb (rate lb/in)</option>
                <option value="N">N (rate N/mm)</option>
              </select>
            </label>
            <LabelledCell
              label="Finished bore"
              unit={unit}
              value={specs.bore}
              placeholder={jobBore && jobBore.unit === unit ? jobBore.value : undefined}
              onChange={(v) => setSpecs((s) => ({ ...s, bore: typed(v) }))}
              onCommit={commit("specs")}
              error={fieldError(state.specs, "bore")}
              {...ro}
            />
            <LabelledCell
              label="Stroke"
              unit={unit}
              value={specs.stroke}
              onChange={(v) => setSpecs((s) => ({ ...s, stroke: typed(v) }))}
              onCommit={commit("specs")}
              error={fieldError(state.specs, "stroke")}
              {...ro}
            />
            <h3 className="pt-2 text-sm font-semibold">Rings</h3>
            <label className="flex items-center justify-between gap-2 text-sm">
              <span className="text-graphite-700">Ring maker or set</span>
              <input
                list="ring-makers"
                className="w-40 rounded border border-graphite-300 px-1.5 py-1 text-sm"
                value={specs.ringMaker ?? ""}
                readOnly={readOnly}
                onChange={(e) => setSpecs((s) => ({ ...s, ringMaker: e.target.value || null }))}
                onBlur={commit("specs")}
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
                  setSpecs((s) => ({
                    ...s,
                    ringUse: (e.target.value || null) as BuildRecordData["specs"]["ringUse"],
                  }));
                  void save("specs");
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
            {RING_POSITIONS.map((ring) => (
              <LabelledCell
                key={ring}
                label={`${RING_WORDS[ring]} gap factor`}
                value={specs.ringFactors[ring]}
                onChange={(v) =>
                  setSpecs((s) => ({ ...s, ringFactors: { ...s.ringFactors, [ring]: typed(v) } }))
                }
                onCommit={commit("specs")}
                error={fieldError(state.specs, `ringFactors.${ring}`)}
                {...ro}
              />
            ))}
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
            ).map(([key, label, u]) => (
              <LabelledCell
                key={key}
                label={label}
                unit={u}
                inputMode="text"
                value={specs.cam[key]}
                placeholder={
                  key === "installCentreline" && card ? card.intakeCentreline : undefined
                }
                onChange={(v) => setSpecs((s) => ({ ...s, cam: { ...s.cam, [key]: typed(v) } }))}
                onCommit={commit("specs")}
                error={fieldError(state.specs, `cam.${key}`)}
                {...ro}
              />
            ))}
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
            ).map(([key, label, u]) => (
              <LabelledCell
                key={key}
                label={label}
                unit={u}
                value={specs.spring[key]}
                onChange={(v) =>
                  setSpecs((s) => ({ ...s, spring: { ...s.spring, [key]: typed(v) } }))
                }
                onCommit={commit("specs")}
                error={fieldError(state.specs, `spring.${key}`)}
                {...ro}
              />
            ))}
          </div>
          <div className="space-y-2">
            <h3 className="text-sm font-semibold">Bearing clearance (engine maker)</h3>
            {JOURNAL_KINDS.map((kind) =>
              (["min", "max"] as const).map((end) => (
                <LabelledCell
                  key={`${kind}${end}`}
                  label={`${KIND_WORDS[kind]} clearance ${end === "min" ? "from" : "to"}`}
                  unit={unit}
                  value={specs.clearance[kind][end]}
                  onChange={(v) =>
                    setSpecs((s) => ({
                      ...s,
                      clearance: {
                        ...s.clearance,
                        [kind]: { ...s.clearance[kind], [end]: typed(v) },
                      },
                    }))
                  }
                  onCommit={commit("specs")}
                  error={fieldError(state.specs, `clearance.${kind}.${end}`)}
                  {...ro}
                />
              )),
            )}
            <h3 className="pt-2 text-sm font-semibold">Compression</h3>
            {(
              [
                ["chamberCc", "Chamber", "cc"],
                ["pistonCc", "Piston dish + / dome −", "cc"],
                ["gasketBore", "Gasket bore", unit],
                ["gasketThickness", "Gasket thickness", unit],
              ] as const
            ).map(([key, label, u]) => (
              <LabelledCell
                key={key}
                label={label}
                unit={u}
                inputMode={key === "pistonCc" ? "text" : "decimal"}
                value={specs.compression[key]}
                onChange={(v) =>
                  setSpecs((s) => ({ ...s, compression: { ...s.compression, [key]: typed(v) } }))
                }
                onCommit={commit("specs")}
                error={fieldError(state.specs, `compression.${key}`)}
                {...ro}
              />
            ))}
          </div>
        </div>
      </BuildPanel>

      <BuildPanel
        section="rings"
        title="Ring gaps"
        state={state.rings}
        onResolve={resolve("rings")}
        note="Ring squared in its own bore, gap read with a feeler gauge. Gap to file to = factor × finished bore. A new figure in a box is kept as a new reading; file the ring ends square, never the bore."
      >
        <table className="text-sm">
          <thead>
            <tr className="text-left text-graphite-500">
              <th className="pr-3 font-semibold">Cyl</th>
              <th className="pr-3 font-semibold">Ring</th>
              <th className="pr-3 font-semibold">Gap to file to</th>
              <th className="pr-3 font-semibold">Measured ({unit})</th>
              <th className="pr-3 font-semibold">Earlier</th>
              <th className="pr-3 font-semibold">To file</th>
              <th className="pr-3 font-semibold">Done</th>
            </tr>
          </thead>
          <tbody>
            {cyls.flatMap((c) =>
              RING_POSITIONS.map((ring) => {
                const i = ringIndex(c, ring);
                const row = i >= 0 ? data.rings.rows[i] : undefined;
                const r = i >= 0 ? results.rings[i] : undefined;
                const last = row?.readings.at(-1) ?? null;
                const key = `${c}:${ring}`;
                const factor = specs.ringFactors[ring];
                // The target shown even before a reading: factor × bore.
                const target = r?.result?.ok === true ? r.result.value.target : targetOnly(factor);
                const precision = [last ?? specs.bore];
                const status = r?.result?.ok ? r.result.value.status : undefined;
                return (
                  <tr key={key} data-testid={`ring-${c}-${ring}`}>
                    <td className="pr-3 font-mono">{ring === "top" ? c : ""}</td>
                    <td className="pr-3">{RING_WORDS[ring]}</td>
                    <td className="pr-3 font-mono">
                      {target
                        ? formatDerivedLength(
                            r?.result?.ok ? r.result.value.target : target,
                            precision,
                          )
                        : "—"}
                    </td>
                    <td className="pr-3 py-0.5">
                      <Cell
                        label={`Cylinder ${c} ${RING_WORDS[ring]} gap`}
                        value={ringDrafts[key] ?? last}
                        onChange={(v) => setRingDrafts((d) => ({ ...d, [key]: v }))}
                        onCommit={() => commitRing(c, ring)}
                        error={fieldError(state.rings, `rows.${i}.readings`)}
                        {...ro}
                      />
                    </td>
                    <td className="pr-3 font-mono text-graphite-500">
                      {row && row.readings.length > 1 ? row.readings.slice(0, -1).join(", ") : ""}
                    </td>
                    <td
                      className={`pr-3 ${status ? STATUS_CLASS[status] : ""}`}
                      data-testid={`ring-status-${c}-${ring}`}
                    >
                      {r?.result && !r.result.ok
                        ? r.result.refusal.message
                        : status === "tight"
                          ? `File ${formatDerivedLength(r!.result!.ok ? (r!.result!.value.fileOff ?? "0") : "0", precision)}`
                          : status === "ok"
                            ? "In gap"
                            : status === "wide"
                              ? "Too wide"
                              : ""}
                    </td>
                    <td className="pr-3 text-center">
                      <input
                        type="checkbox"
                        aria-label={`Cylinder ${c} ${RING_WORDS[ring]} done`}
                        checked={row?.done ?? false}
                        disabled={readOnly || status === undefined || status === "tight"}
                        title={status === "tight" ? "Still tight: file it first" : undefined}
                        onChange={(e) => setRingDone(c, ring, e.target.checked)}
                      />
                    </td>
                  </tr>
                );
              }),
            )}
          </tbody>
        </table>
      </BuildPanel>

      <div className="grid gap-6 lg:grid-cols-2">
        <BuildPanel
          section="tdc"
          title="True TDC (piston stop)"
          state={state.tdc}
          onResolve={resolve("tdc")}
          note="Turn the crank until the piston touches the stop, read the wheel, turn back to the stop and read again. After TDC positive, before TDC negative."
        >
          <div className="space-y-2">
            <LabelledCell
              label="First stop reading"
              unit="°"
              inputMode="text"
              value={data.tdc.firstStop}
              onChange={(v) => update("tdc", (t) => ({ ...t, firstStop: typed(v) }))}
              onCommit={commit("tdc")}
              error={fieldError(state.tdc, "firstStop")}
              {...ro}
            />
            <LabelledCell
              label="Second stop reading"
              unit="°"
              inputMode="text"
              value={data.tdc.secondStop}
              onChange={(v) => update("tdc", (t) => ({ ...t, secondStop: typed(v) }))}
              onCommit={commit("tdc")}
              error={fieldError(state.tdc, "secondStop")}
              {...ro}
            />
            <p className="text-sm" data-testid="tdc-result">
              {results.tdc === null
                ? ""
                : !results.tdc.ok
                  ? results.tdc.refusal.message
                  : Number(results.tdc.value.offset) === 0
                    ? `The pointer already reads true TDC; each stop reads ${formatAngle(results.tdc.value.eachSide)}°.`
                    : `At true TDC the wheel reads ${formatAngle(results.tdc.value.offset.replace("-", ""))}° ${Number(results.tdc.value.offset) > 0 ? "ATDC" : "BTDC"}: move the pointer so it reads 0 there; each stop then reads ${formatAngle(results.tdc.value.eachSide)}°.`}
            </p>
          </div>
        </BuildPanel>

        <BuildPanel
          section="cam"
          title="Cam checks (intake centreline, equal lift)"
          state={state.cam}
          onResolve={resolve("cam")}
          note="Read the crank angle at the same lift on each side of full lift, turning the engine in its normal direction. Check two or three times, turning the crank twice and re-checking TDC before each."
        >
          <div className="space-y-2">
            <LabelledCell
              label="Checking lift"
              unit={unit}
              value={data.cam.lift}
              placeholder={
                settings.camCheckLift && settings.lengthUnit === unit
                  ? settings.camCheckLift
                  : undefined
              }
              onChange={(v) => update("cam", (c) => ({ ...c, lift: typed(v) }))}
              onCommit={commit("cam")}
              error={fieldError(state.cam, "lift")}
              {...ro}
            />
            <p className="text-sm text-graphite-600">
              Install at{" "}
              {results.installCentreline
                ? `${formatAngle(results.installCentreline)}° ATDC`
                : "— (enter the cam card)"}
            </p>
            <table className="text-sm">
              <thead>
                <tr className="text-left text-graphite-500">
                  <th className="pr-2 font-semibold">#</th>
                  <th className="pr-2 font-semibold">Opening side</th>
                  <th className="pr-2 font-semibold">Closing side</th>
                  <th className="pr-2 font-semibold">Final</th>
                  <th className="pr-2 font-semibold">Centreline</th>
                  <th className="font-semibold">Move</th>
                </tr>
              </thead>
              <tbody>
                {data.cam.checks.map((check, i) => {
                  const r = results.cam[i];
                  const cl = r?.centreline;
                  const corr = r?.correction;
                  return (
                    <tr key={i} data-testid={`cam-check-${i + 1}`}>
                      <td className="pr-2 font-mono">{i + 1}</td>
                      {(["openingSide", "closingSide"] as const).map((side) => (
                        <td key={side} className="py-0.5 pr-2">
                          <Cell
                            label={`Check ${i + 1} ${side === "openingSide" ? "opening" : "closing"} side (° ATDC)`}
                            inputMode="text"
                            className="w-20"
                            value={check[side]}
                            onChange={(v) =>
                              update("cam", (c) => ({
                                ...c,
                                checks: c.checks.map((k, j) =>
                                  j === i ? { ...k, [side]: typed(v) } : k,
                                ),
                              }))
                            }
                            onCommit={commit("cam")}
                            error={fieldError(state.cam, `checks.${i}.${side}`)}
                            {...ro}
                          />
                        </td>
                      ))}
                      <td className="pr-2 text-center">
                        <input
                          type="checkbox"
                          aria-label={`Check ${i + 1}: crank turned twice, TDC re-checked`}
                          title="Crank turned twice, TDC re-checked"
                          checked={check.final}
                          disabled={readOnly}
                          onChange={(e) => {
                            update("cam", (c) => ({
                              ...c,
                              checks: c.checks.map((k, j) =>
                                j === i ? { ...k, final: e.target.checked } : k,
                              ),
                            }));
                            void save("cam");
                          }}
                        />
                      </td>
                      <td className="pr-2 font-mono">
                        {cl?.ok ? `${formatAngle(cl.value.centreline)}°` : ""}
                      </td>
                      <td data-testid={`cam-move-${i + 1}`}>
                        {cl && !cl.ok
                          ? cl.refusal.message
                          : corr?.ok
                            ? corr.value.direction === "none"
                              ? "On the card"
                              : `${cl?.ok && cl.value.phasing ? `${formatAngle(cl.value.advance!.replace("-", ""))}° ${cl.value.phasing}: ` : ""}${corr.value.direction === "advance" ? "advance" : "retard"} the cam ${formatAngle(corr.value.move)}° (${formatAngle(corr.value.camDegrees, 2)}° at the sprocket)`
                            : ""}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            {!readOnly ? (
              <button
                type="button"
                className="btn-secondary py-1 text-sm"
                onClick={() => {
                  update("cam", (c) => ({
                    ...c,
                    lift: c.lift ?? (settings.lengthUnit === unit ? settings.camCheckLift : null),
                    checks: [...c.checks, { openingSide: null, closingSide: null, final: false }],
                  }));
                  setTimeout(() => {
                    const cells = document.querySelectorAll<HTMLInputElement>(
                      '[data-section="cam"] tbody tr:last-child input[data-cell]',
                    );
                    cells[0]?.focus();
                  }, 0);
                }}
              >
                Add a check
              </button>
            ) : null}
          </div>
        </BuildPanel>
      </div>

      <BuildPanel
        section="springs"
        title="Valve springs"
        state={state.springs}
        onResolve={resolve("springs")}
        note={`Installed height from the spring seat to the underside of the retainer, without the shim; load as read on the spring tester at that height. Loads in ${load}.`}
      >
        <table className="text-sm">
          <thead>
            <tr className="text-left text-graphite-500">
              <th className="pr-3 font-semibold">Cyl</th>
              <th className="pr-3 font-semibold">Valve</th>
              <th className="pr-3 font-semibold">Installed height</th>
              <th className="pr-3 font-semibold">Shim</th>
              <th className="pr-3 font-semibold">Load at height</th>
              <th className="pr-3 font-semibold">Seat</th>
              <th className="pr-3 font-semibold">Open</th>
              <th className="pr-3 font-semibold">Coil-bind margin</th>
              <th className="font-semibold" />
            </tr>
          </thead>
          <tbody>
            {cyls.flatMap((c) =>
              VALVES.map((valve) => {
                const row = springRow(c, valve);
                const i = row ? data.springs.rows.indexOf(row) : -1;
                const r = i >= 0 ? results.springs[i] : undefined;
                const v = r?.result?.ok ? r.result.value : null;
                const lengths = [
                  row?.installedHeight ?? specs.spring.installedHeight,
                  row?.shim,
                  specs.spring.lift,
                  specs.spring.solidHeight,
                ];
                return (
                  <tr key={`${c}${valve}`} data-testid={`spring-${c}-${valve}`}>
                    <td className="pr-3 font-mono">{valve === "intake" ? c : ""}</td>
                    <td className="pr-3">{VALVE_WORDS[valve]}</td>
                    {(["installedHeight", "shim", "seatLoad"] as const).map((key) => (
                      <td key={key} className="py-0.5 pr-3">
                        <Cell
                          label={`Cylinder ${c} ${valve} ${key === "installedHeight" ? "installed height" : key === "shim" ? "shim" : "load at installed height"}`}
                          value={row?.[key] ?? null}
                          placeholder={
                            key === "installedHeight"
                              ? (specs.spring.installedHeight ?? undefined)
                              : undefined
                          }
                          onChange={(val) => setSpring(c, valve, { [key]: typed(val) })}
                          onCommit={commit("springs")}
                          error={fieldError(state.springs, `rows.${i}.${key}`)}
                          {...ro}
                        />
                      </td>
                    ))}
                    <td className="pr-3 font-mono">{v ? formatLoad(v.seatLoad) : ""}</td>
                    <td className="pr-3 font-mono">{v ? formatLoad(v.openLoad) : ""}</td>
                    <td className="pr-3 font-mono">
                      {v?.coilBindMargin !== undefined
                        ? formatLengthAsTyped(v.coilBindMargin, lengths)
                        : ""}
                    </td>
                    <td className="text-machine">
                      {r?.result && !r.result.ok ? r.result.refusal.message : r?.flags.join("; ")}
                    </td>
                  </tr>
                );
              }),
            )}
          </tbody>
        </table>
      </BuildPanel>

      <BuildPanel
        section="clearances"
        title="Bearing clearances"
        state={state.clearances}
        onResolve={resolve("clearances")}
        note="Bearing bore with the shells in and the cap torqued to the engine maker's figure; journal with a micrometer. Front and rear, vertical and horizontal. Clearance = bore − journal (the tightest and the widest pair)."
      >
        {!readOnly ? (
          <label className="mb-2 flex items-center gap-2 text-sm">
            Main journals
            <input
              type="number"
              min={1}
              max={16}
              className="w-16 rounded border border-graphite-300 px-1.5 py-1 text-sm"
              value={mains}
              onChange={(e) => setMains(Math.min(16, Math.max(1, Number(e.target.value) || 1)))}
            />
          </label>
        ) : null}
        <div className="overflow-x-auto">
          <table className="text-sm">
            <thead>
              <tr className="text-left text-graphite-500">
                <th className="pr-2 font-semibold">Journal</th>
                <th className="pr-2 font-semibold" colSpan={4}>
                  Bore: front V, H · rear V, H
                </th>
                <th className="pr-2 font-semibold" colSpan={4}>
                  Journal: front V, H · rear V, H
                </th>
                <th className="pr-2 font-semibold">Clearance</th>
                <th className="pr-2 font-semibold">Per inch</th>
                <th className="pr-2 font-semibold">Journal taper / out-of-round</th>
                <th className="font-semibold" />
              </tr>
            </thead>
            <tbody>
              {journals.map(({ kind, journal }) => {
                const row = clearanceRow(kind, journal);
                const i = row ? data.clearances.rows.indexOf(row) : -1;
                const r = i >= 0 ? results.clearances[i] : undefined;
                const v = r?.result?.ok ? r.result.value : null;
                const typedReadings = row
                  ? [...row.bore.flat(), ...row.journalDiameter.flat()]
                  : [];
                const places = Math.max(0, ...typedReadings.map(decimalsOf));
                const asTyped = (x: string) => formatLengthAsTyped(x, ["0." + "0".repeat(places)]);
                return (
                  <tr key={`${kind}${journal}`} data-testid={`clearance-${kind}-${journal}`}>
                    <td className="pr-2">
                      {KIND_WORDS[kind]} {journal}
                    </td>
                    {(["bore", "journalDiameter"] as const).flatMap((part) =>
                      [0, 1].flatMap((p) =>
                        [0, 1].map((d) => (
                          <td key={`${part}${p}${d}`} className="py-0.5 pr-1">
                            <Cell
                              label={`${KIND_WORDS[kind]} ${journal} ${part === "bore" ? "bore" : "journal"} ${p === 0 ? "front" : "rear"} ${d === 0 ? "vertical" : "horizontal"}`}
                              className="w-20"
                              value={row?.[part][p]?.[d] ?? null}
                              onChange={(val) => setReading(kind, journal, part, p, d, typed(val))}
                              onCommit={commit("clearances")}
                              error={fieldError(state.clearances, `rows.${i}.${part}.${p}.${d}`)}
                              {...ro}
                            />
                          </td>
                        )),
                      ),
                    )}
                    <td className={`pr-2 font-mono ${v?.status ? STATUS_CLASS[v.status] : ""}`}>
                      {v
                        ? `${asTyped(v.clearance)}${v.widestClearance && v.widestClearance !== v.clearance ? `–${asTyped(v.widestClearance)}` : ""}`
                        : ""}
                    </td>
                    <td className="pr-2 font-mono">
                      {v ? formatPerUnit(v.perJournalDiameter) : ""}
                    </td>
                    <td className="pr-2 font-mono">
                      {v?.journalGeometry
                        ? `${v.journalGeometry.taper !== undefined ? asTyped(v.journalGeometry.taper) : "—"} / ${v.journalGeometry.outOfRound !== undefined ? asTyped(v.journalGeometry.outOfRound) : "—"}`
                        : ""}
                    </td>
                    <td className={v?.status ? STATUS_CLASS[v.status] : "text-replace"}>
                      {r?.result && !r.result.ok
                        ? r.result.refusal.message
                        : v?.status
                          ? `${v.status === "ok" ? "In the window" : v.status === "tight" ? "Tight" : v.status === "wide" ? "Wide" : "Interference: never assemble"}${r?.window.from === "shop" ? " (shop guide)" : ""}`
                          : ""}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </BuildPanel>

      <BuildPanel
        section="deck"
        title="Deck clearance and compression ratio"
        state={state.deck}
        onResolve={resolve("deck")}
        note="Deck clearance measured at TDC with a dial indicator: piston below the deck positive, above it negative. A chamber volume typed here replaces the engine's for that cylinder."
      >
        <table className="text-sm">
          <thead>
            <tr className="text-left text-graphite-500">
              <th className="pr-3 font-semibold">Cyl</th>
              <th className="pr-3 font-semibold">Deck clearance ({unit})</th>
              <th className="pr-3 font-semibold">Chamber (cc)</th>
              <th className="pr-3 font-semibold">Quench</th>
              <th className="pr-3 font-semibold">Clearance volume</th>
              <th className="pr-3 font-semibold">Compression ratio</th>
            </tr>
          </thead>
          <tbody>
            {cyls.map((c) => {
              const row = deckRow(c);
              const i = row ? data.deck.rows.indexOf(row) : -1;
              const r = i >= 0 ? results.deck[i] : undefined;
              return (
                <tr key={c} data-testid={`deck-${c}`}>
                  <td className="pr-3 font-mono">{c}</td>
                  <td className="py-0.5 pr-3">
                    <Cell
                      label={`Cylinder ${c} deck clearance`}
                      inputMode="text"
                      value={row?.deckClearance ?? null}
                      onChange={(v) => setDeck(c, { deckClearance: typed(v) })}
                      onCommit={commit("deck")}
                      error={fieldError(state.deck, `rows.${i}.deckClearance`)}
                      {...ro}
                    />
                  </td>
                  <td className="py-0.5 pr-3">
                    <Cell
                      label={`Cylinder ${c} chamber volume`}
                      value={row?.chamberCc ?? null}
                      placeholder={specs.compression.chamberCc ?? undefined}
                      onChange={(v) => setDeck(c, { chamberCc: typed(v) })}
                      onCommit={commit("deck")}
                      error={fieldError(state.deck, `rows.${i}.chamberCc`)}
                      {...ro}
                    />
                  </td>
                  <td className="pr-3 font-mono">
                    {r?.quench
                      ? formatLengthAsTyped(r.quench, [
                          row?.deckClearance,
                          specs.compression.gasketThickness,
                        ])
                      : ""}
                  </td>
                  <td className="pr-3 font-mono">
                    {r?.result?.ok ? `${formatCc(r.result.value.clearanceCc)} cc` : ""}
                  </td>
                  <td className="pr-3 font-mono" data-testid={`deck-ratio-${c}`}>
                    {!r?.result
                      ? ""
                      : r.result.ok
                        ? formatRatio(r.result.value.ratio)
                        : r.result.refusal.message}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </BuildPanel>
    </div>
  );
}
