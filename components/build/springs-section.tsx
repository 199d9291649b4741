"use client";

import { formatLengthAsTyped, formatLoad } from "@/lib/build-record/format";
import { type BuildRecordData, VALVES } from "@/lib/build-record/schemas";
import { bindSection, BuildPanel, Cell, typed } from "./cells";
import { type SectionProps, upsertRow } from "./use-build-record";

type SpringRow = BuildRecordData["springs"]["rows"][number];
type Valve = SpringRow["valve"];

const VALVE_WORDS = { intake: "Intake", exhaust: "Exhaust" } as const;
const FIGURES = [
  ["installedHeight", "installed height"],
  ["shim", "shim"],
  ["seatLoad", "load at installed height"],
] as const;

/**
 * Valve springs, one row per cylinder and valve (made when a figure is typed): installed height,
 * shim and load as read, with the seat and open loads and the coil-bind margin worked out.
 */
export function SpringsSection(props: SectionProps) {
  const { editor, results, cylinders } = props;
  const b = bindSection(props, "springs");
  const { data } = editor;
  const specs = data.specs;
  const matches = (c: number, valve: Valve) => (r: SpringRow) =>
    r.cylinder === c && r.valve === valve;
  const setSpring = (c: number, valve: Valve, change: Partial<SpringRow>) =>
    editor.update("springs", (s) => ({
      rows: upsertRow(
        s.rows,
        matches(c, valve),
        { cylinder: c, valve, installedHeight: null, shim: null, seatLoad: null },
        (row) => ({ ...row, ...change }),
        (r) => !!(r.installedHeight || r.shim || r.seatLoad),
      ),
    }));

  return (
    <BuildPanel
      {...b.panel}
      title="Valve springs"
      note={`Installed height from the spring seat to the underside of the retainer, without the shim; load as read on the spring tester at that height. Loads in ${specs.loadUnit}.`}
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
          {cylinders.flatMap((c) =>
            VALVES.map((valve) => {
              const i = data.springs.rows.findIndex(matches(c, valve));
              const row = i >= 0 ? data.springs.rows[i] : undefined;
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
                  {FIGURES.map(([key, words]) => (
                    <td key={key} className="py-0.5 pr-3">
                      <Cell
                        label={`Cylinder ${c} ${valve} ${words}`}
                        value={row?.[key] ?? null}
                        placeholder={
                          key === "installedHeight"
                            ? (specs.spring.installedHeight ?? undefined)
                            : undefined
                        }
                        onChange={(val) => setSpring(c, valve, { [key]: typed(val) })}
                        onCommit={b.commit}
                        error={b.error(`rows.${i}.${key}`)}
                        {...b.ro}
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
  );
}
