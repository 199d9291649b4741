"use client";

import { useState } from "react";
import { ringEndGap } from "@/lib/assembly";
import { formatDerivedLength } from "@/lib/build-record/format";
import { RING_POSITIONS, type RingPosition } from "@/lib/build-record/schemas";
import { RING_WORDS } from "./build-settings-form";
import { bindSection, BuildPanel, Cell, STATUS_CLASS, typed } from "./cells";
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

  const targetOnly = (factor: string | null): string | null => {
    if (!specs.bore || !factor) return null;
    try {
      return ringEndGap({ bore: specs.bore, factor }).target;
    } catch {
      return null; // the refusal shows once a gap is measured
    }
  };

  return (
    <BuildPanel
      {...b.panel}
      title="Ring gaps"
      note="Ring squared in its own bore, gap read with a feeler gauge. Gap to file to = factor × finished bore. A new figure in a box is kept as a new reading; file the ring ends square, never the bore."
    >
      <table className="text-sm">
        <thead>
          <tr className="text-left text-graphite-500">
            <th className="pr-3 font-semibold">Cyl</th>
            <th className="pr-3 font-semibold">Ring</th>
            <th className="pr-3 font-semibold">Gap to file to</th>
            <th className="pr-3 font-semibold">Measured ({specs.lengthUnit})</th>
            <th className="pr-3 font-semibold">Earlier</th>
            <th className="pr-3 font-semibold">To file</th>
            <th className="pr-3 font-semibold">Done</th>
          </tr>
        </thead>
        <tbody>
          {cylinders.flatMap((c) =>
            RING_POSITIONS.map((ring) => {
              const i = data.rings.rows.findIndex(matches(c, ring));
              const row = i >= 0 ? data.rings.rows[i] : undefined;
              const r = i >= 0 ? results.rings[i] : undefined;
              const last = row?.readings.at(-1) ?? null;
              const key = `${c}:${ring}`;
              // The target shown even before a reading: factor × bore.
              const target =
                r?.result?.ok === true
                  ? r.result.value.target
                  : targetOnly(specs.ringFactors[ring]);
              const precision = [last ?? specs.bore];
              const status = r?.result?.ok ? r.result.value.status : undefined;
              return (
                <tr key={key} data-testid={`ring-${c}-${ring}`}>
                  <td className="pr-3 font-mono">{ring === "top" ? c : ""}</td>
                  <td className="pr-3">{RING_WORDS[ring]}</td>
                  <td className="pr-3 font-mono">
                    {target ? formatDerivedLength(target, precision) : "—"}
                  </td>
                  <td className="pr-3 py-0.5">
                    <Cell
                      label={`Cylinder ${c} ${RING_WORDS[ring]} gap`}
                      value={drafts[key] ?? last}
                      onChange={(v) => setDrafts((d) => ({ ...d, [key]: v }))}
                      onCommit={() => commitRing(c, ring)}
                      error={b.error(`rows.${i}.readings`)}
                      {...b.ro}
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
                      onChange={(e) => setDone(c, ring, e.target.checked)}
                    />
                  </td>
                </tr>
              );
            }),
          )}
        </tbody>
      </table>
    </BuildPanel>
  );
}
