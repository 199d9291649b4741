"use client";

import { useState } from "react";
import { decimalsOf, formatLengthAsTyped, formatPerUnit } from "@/lib/build-record/format";
import type { BuildRecordData } from "@/lib/build-record/schemas";
import {
  bindSection,
  BuildPanel,
  Cell,
  StackCell,
  StackRow,
  StackTable,
  STATUS_CLASS,
  typed,
} from "./cells";
import { type SectionProps, upsertRow } from "./use-build-record";

type ClearanceRow = BuildRecordData["clearances"]["rows"][number];
type Kind = ClearanceRow["kind"];
type Part = "bore" | "journalDiameter";

const KIND_WORDS = { main: "Main", rod: "Rod" } as const;
const STATUS_WORDS = {
  ok: "In the window",
  tight: "Tight",
  wide: "Wide",
  interference: "Interference: never assemble",
} as const;

/** Where each of the four readings of a bore or a journal is taken: [end][direction]. */
const PLACES = [0, 1].flatMap((p) => [0, 1].map((d) => [p, d] as const));
const END_WORDS = ["front", "rear"] as const;
const DIRECTION_WORDS = ["vertical", "horizontal"] as const;
const PART_WORDS = { bore: "Bearing bore", journalDiameter: "Journal" } as const;

const emptyGrid = () => [
  [null, null],
  [null, null],
];

/**
 * Bearing clearances, main and rod journals: bore (shells in, cap torqued) and journal read front
 * and rear, vertical and horizontal; clearance, per inch of journal, taper and out-of-round.
 */
export function ClearancesSection(props: SectionProps) {
  const { editor, results, readOnly, cylinders } = props;
  const b = bindSection(props, "clearances");
  const { data } = editor;
  const unit = data.specs.lengthUnit;
  // Clearance over journal diameter: the same figure per inch or per mm.
  const perJournal = `Per ${unit === "in" ? "inch" : "mm"} of journal`;
  const storedMains = Math.max(
    0,
    ...data.clearances.rows.filter((r) => r.kind === "main").map((r) => r.journal),
  );
  const [mains, setMains] = useState(Math.max(storedMains, 5));
  const journals = [
    ...Array.from({ length: mains }, (_, i) => ({ kind: "main" as const, journal: i + 1 })),
    ...cylinders.map((c) => ({ kind: "rod" as const, journal: c })),
  ];
  const matches = (kind: Kind, journal: number) => (r: ClearanceRow) =>
    r.kind === kind && r.journal === journal;
  const setReading = (
    kind: Kind,
    journal: number,
    part: Part,
    p: number,
    d: number,
    value: string | null,
  ) =>
    editor.update("clearances", (s) => ({
      rows: upsertRow(
        s.rows,
        matches(kind, journal),
        { kind, journal, bore: emptyGrid(), journalDiameter: emptyGrid() },
        (row) => {
          const grid = [0, 1].map((pp) => [0, 1].map((dd) => row[part][pp]?.[dd] ?? null));
          grid[p]![d] = value;
          return { ...row, [part]: grid };
        },
        (r) => [...r.bore.flat(), ...r.journalDiameter.flat()].some((v) => v),
      ),
    }));

  return (
    <BuildPanel
      {...b.panel}
      title="Bearing clearances"
      note={`Bearing bore with the shells in and the cap torqued to the engine maker's figure; journal with a micrometer. Each read at the front and the rear end, vertically (V) and horizontally (H), in ${unit}. Clearance = bore − journal (the tightest and the widest pair).`}
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
      <StackTable
        head={
          <>
            <tr className="text-left text-graphite-500">
              <th className="pr-2 font-semibold" rowSpan={2}>
                Journal
              </th>
              {(["bore", "journalDiameter"] as const).map((part) => (
                <th
                  key={part}
                  id={`clearance-head-${part}`}
                  className="pr-2 font-semibold"
                  colSpan={4}
                  scope="colgroup"
                >
                  {PART_WORDS[part]} ({unit})
                </th>
              ))}
              <th className="pr-2 font-semibold" rowSpan={2}>
                Clearance ({unit})
              </th>
              <th className="pr-2 font-semibold" rowSpan={2}>
                {perJournal}
              </th>
              <th className="pr-2 font-semibold" rowSpan={2}>
                Journal taper / out-of-round ({unit})
              </th>
              <th className="font-semibold" rowSpan={2} />
            </tr>
            <tr className="text-left align-bottom text-xs text-graphite-500">
              {(["bore", "journalDiameter"] as const).flatMap((part) =>
                PLACES.map(([p, d]) => (
                  <th key={`${part}${p}${d}`} className="pr-1 font-normal" scope="col">
                    {`${END_WORDS[p]} ${DIRECTION_WORDS[d]}`.replace(/^./, (x) => x.toUpperCase())}
                  </th>
                )),
              )}
            </tr>
          </>
        }
      >
        {journals.map(({ kind, journal }) => {
          const i = data.clearances.rows.findIndex(matches(kind, journal));
          const row = i >= 0 ? data.clearances.rows[i] : undefined;
          const r = i >= 0 ? results.clearances[i] : undefined;
          const v = r?.result?.ok ? r.result.value : null;
          const typedReadings = row ? [...row.bore.flat(), ...row.journalDiameter.flat()] : [];
          const places = Math.max(0, ...typedReadings.map(decimalsOf));
          const asTyped = (x: string) => formatLengthAsTyped(x, ["0." + "0".repeat(places)]);
          return (
            <StackRow
              key={`${kind}${journal}`}
              title={`${KIND_WORDS[kind]} ${journal}`}
              twoUp
              data-testid={`clearance-${kind}-${journal}`}
            >
              <StackCell deskOnly className="pr-2">
                {KIND_WORDS[kind]} {journal}
              </StackCell>
              {(["bore", "journalDiameter"] as const).flatMap((part) => [
                <StackCell
                  key={part}
                  phoneOnly
                  wide
                  className="pt-1 text-xs font-semibold text-graphite-600"
                >
                  {PART_WORDS[part]} ({unit})
                </StackCell>,
                ...PLACES.map(([p, d]) => (
                  <StackCell
                    key={`${part}${p}${d}`}
                    label={`${p === 0 ? "Front" : "Rear"} ${d === 0 ? "V" : "H"}`}
                    className="py-0.5 pr-1"
                  >
                    <Cell
                      label={`${KIND_WORDS[kind]} ${journal} ${part === "bore" ? "bore" : "journal"} ${END_WORDS[p]} ${DIRECTION_WORDS[d]} (${unit})`}
                      className="w-20"
                      value={row?.[part][p]?.[d] ?? null}
                      onChange={(val) => setReading(kind, journal, part, p, d, typed(val))}
                      onCommit={b.commit}
                      error={b.error(`rows.${i}.${part}.${p}.${d}`)}
                      {...b.ro}
                    />
                  </StackCell>
                )),
              ])}
              <StackCell
                label={`Clearance (${unit})`}
                wide
                className={`pr-2 font-mono ${v?.status ? STATUS_CLASS[v.status] : ""}`}
              >
                {v
                  ? `${asTyped(v.clearance)}${v.widestClearance && v.widestClearance !== v.clearance ? `–${asTyped(v.widestClearance)}` : ""}`
                  : ""}
              </StackCell>
              <StackCell label={perJournal} wide className="pr-2 font-mono">
                {v ? formatPerUnit(v.perJournalDiameter) : ""}
              </StackCell>
              <StackCell label={`Taper / out-of-round (${unit})`} wide className="pr-2 font-mono">
                {v?.journalGeometry
                  ? `${v.journalGeometry.taper !== undefined ? asTyped(v.journalGeometry.taper) : "—"} / ${v.journalGeometry.outOfRound !== undefined ? asTyped(v.journalGeometry.outOfRound) : "—"}`
                  : ""}
              </StackCell>
              <StackCell wide className={v?.status ? STATUS_CLASS[v.status] : "text-replace"}>
                {r?.result && !r.result.ok
                  ? r.result.refusal.message
                  : v?.status
                    ? `${STATUS_WORDS[v.status]}${r?.window.from === "shop" ? " (shop guide)" : ""}`
                    : ""}
              </StackCell>
            </StackRow>
          );
        })}
      </StackTable>
    </BuildPanel>
  );
}
