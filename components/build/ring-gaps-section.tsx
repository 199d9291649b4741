"use client";

import { useState } from "react";
import { ringEndGap } from "@/lib/assembly";
import { formatDerivedLength } from "@/lib/build-record/format";
import { RING_POSITIONS, type RingPosition } from "@/lib/build-record/schemas";
import { RING_WORDS } from "./build-settings-form";
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

/**
 * Ring gaps: one row per cylinder and ring. A new figure in a box is a new reading (the earlier
 * ones are kept and shown); a ring is ticked done only once its last gap is not tight.
 */
export function RingGapsSection(props: SectionProps) {
  const { editor, results, readOnly, cylinders } = props;
  const b = bindSection(props, "rings");
  const { data } = editor;
  const specs = data.specs;
  const [drafts, setDrafts] = useState<Record<string, string>>({});

  const matches = (c: number, ring: RingPosition) => (r: { cylinder: number; ring: string }) =>
    r.cylinder === c && r.ring === ring;
  const commitRing = (c: number, ring: RingPosition) => {
    const key = `${c}:${ring}`;
    const draft = drafts[key];
    if (draft === undefined) return;
    setDrafts(({ [key]: _gone, ...rest }) => rest);
    const value = typed(draft);
    editor.update("rings", (rings) => {
      const last = rings.rows.find(matches(c, ring))?.readings.at(-1) ?? null;
      if (value === last) return rings;
      const rows = upsertRow(
        rings.rows,
        matches(c, ring),
        { cylinder: c, ring, readings: [], done: false },
        // A new figure is a new reading (the earlier ones are kept); a cleared box takes back
        // the last one (a typing slip).
        (row) => ({
          ...row,
          readings: value === null ? row.readings.slice(0, -1) : [...row.readings, value],
          done: value === null ? false : row.done,
        }),
        (r) => r.readings.length > 0 || r.done,
      );
      return { rows };
    });
    b.commit();
  };
  const setDone = (c: number, ring: RingPosition, done: boolean) => {
    editor.update("rings", (rings) => ({
      rows: rings.rows.map((r) => (matches(c, ring)(r) ? { ...r, done } : r)),
    }));
    b.commit();
  };

  /** The target gap before a reading (factor × bore), or why there is none yet. */
  const targetOnly = (ring: RingPosition): { target: string } | { why: string } => {
    const factor = specs.ringFactors[ring];
    if (!specs.bore || !factor) return { why: "" };
    try {
      return { target: ringEndGap({ bore: specs.bore, factor }).target };
    } catch (e) {
      return { why: e instanceof Error ? e.message : String(e) };
    }
  };
  // What is missing for a target gap, said once above the table.
  const noFactor = RING_POSITIONS.filter((ring) => !specs.ringFactors[ring]);
  const listed = (words: string[]) =>
    words.length > 1 ? `${words.slice(0, -1).join(", ")} and ${words.at(-1)}` : words[0];
  const targetWhy = !specs.bore
    ? noFactor.length > 0
      ? "No target gap yet: enter the finished bore and the gap factors above."
      : "No target gap yet: enter the finished bore above."
    : noFactor.length > 0
      ? `No target gap for the ${listed(noFactor.map((ring) => RING_WORDS[ring].toLowerCase()))}: enter ${noFactor.length > 1 ? "the gap factors" : "the gap factor"} above.`
      : null;

  return (
    <BuildPanel
      {...b.panel}
      title="Ring gaps"
      note="Ring squared in its own bore, gap read with a feeler gauge. Target gap = gap factor × finished bore. A new figure in a box is kept as a new reading; file the ring ends square, never the bore."
    >
      {targetWhy ? (
        <p className="mb-2 text-sm text-machine" data-testid="ring-target-why">
          {targetWhy}
        </p>
      ) : null}
      <StackTable
        head={
          <tr className="text-left text-graphite-500">
            <th className="pr-3 font-semibold">Cyl</th>
            <th className="pr-3 font-semibold">Ring</th>
            <th className="pr-3 font-semibold">Target gap ({specs.lengthUnit})</th>
            <th className="pr-3 font-semibold">Measured ({specs.lengthUnit})</th>
            <th className="pr-3 font-semibold">Earlier</th>
            <th className="pr-3 font-semibold">Still to file off</th>
            <th className="pr-3 font-semibold">Done</th>
          </tr>
        }
      >
        {cylinders.flatMap((c) =>
          RING_POSITIONS.map((ring) => {
            const i = data.rings.rows.findIndex(matches(c, ring));
            const row = i >= 0 ? data.rings.rows[i] : undefined;
            const r = i >= 0 ? results.rings[i] : undefined;
            const last = row?.readings.at(-1) ?? null;
            const key = `${c}:${ring}`;
            // The target shown even before a reading: factor × bore.
            const before = targetOnly(ring);
            const target =
              r?.result?.ok === true
                ? r.result.value.target
                : "target" in before
                  ? before.target
                  : null;
            const why = "why" in before ? before.why || targetWhy || "" : "";
            const precision = [last ?? specs.bore];
            const status = r?.result?.ok ? r.result.value.status : undefined;
            return (
              <StackRow
                key={key}
                title={`Cylinder ${c}, ${RING_WORDS[ring].toLowerCase()}`}
                data-testid={`ring-${c}-${ring}`}
              >
                <StackCell deskOnly className="pr-3 font-mono">
                  {ring === "top" ? c : ""}
                </StackCell>
                <StackCell deskOnly className="pr-3">
                  {RING_WORDS[ring]}
                </StackCell>
                <StackCell
                  label={`Target gap (${specs.lengthUnit})`}
                  className="pr-3 font-mono"
                  data-testid={`ring-target-${c}-${ring}`}
                  title={target ? undefined : why}
                >
                  {target ? (
                    formatDerivedLength(target, precision)
                  ) : (
                    <>
                      <span aria-hidden="true">—</span>
                      <span className="sr-only">{why}</span>
                    </>
                  )}
                </StackCell>
                <StackCell label={`Measured (${specs.lengthUnit})`} className="py-0.5 pr-3">
                  <Cell
                    label={`Cylinder ${c} ${RING_WORDS[ring]} gap`}
                    value={drafts[key] ?? last}
                    onChange={(v) => setDrafts((d) => ({ ...d, [key]: v }))}
                    onCommit={() => commitRing(c, ring)}
                    error={b.error(`rows.${i}.readings`)}
                    {...b.ro}
                  />
                </StackCell>
                <StackCell label="Earlier" className="pr-3 font-mono text-graphite-500">
                  {row && row.readings.length > 1 ? row.readings.slice(0, -1).join(", ") : ""}
                </StackCell>
                <StackCell
                  label="Still to file off"
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
                </StackCell>
                <StackCell label="Done" className="pr-3 text-center">
                  <input
                    type="checkbox"
                    aria-label={`Cylinder ${c} ${RING_WORDS[ring]} done`}
                    checked={row?.done ?? false}
                    disabled={readOnly || status === undefined || status === "tight"}
                    title={status === "tight" ? "Still tight: file it first" : undefined}
                    onChange={(e) => setDone(c, ring, e.target.checked)}
                  />
                </StackCell>
              </StackRow>
            );
          }),
        )}
      </StackTable>
    </BuildPanel>
  );
}
