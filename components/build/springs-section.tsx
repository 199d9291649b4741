"use client";

import { formatLengthAsTyped, formatLoad } from "@/lib/build-record/format";
import { type BuildRecordData, VALVES } from "@/lib/build-record/schemas";
import { bindSection, BuildPanel, Cell, StackCell, StackRow, StackTable, typed } from "./cells";
import { type SectionProps, upsertRow } from "./use-build-record";

type SpringRow = BuildRecordData["springs"]["rows"][number];
type Valve = SpringRow["valve"];

const VALVE_WORDS = { intake: "Intake", exhaust: "Exhaust" } as const;
const FIGURES = [
  ["installedHeight", "installed height", "Installed height"],
  ["shim", "shim", "Shim"],
  ["seatLoad", "load at installed height", "Load at height"],
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
      <StackTable
        head={
          <tr className="text-left text-graphite-500">
            <th className="pr-3 font-semibold">Cyl</th>
            <th className="pr-3 font-semibold">Valve</th>
            {FIGURES.map(([key, , heading]) => (
              <th key={key} className="pr-3 font-semibold">
                {heading}
              </th>
            ))}
            <th className="pr-3 font-semibold">Seat</th>
            <th className="pr-3 font-semibold">Open</th>
            <th className="pr-3 font-semibold">Coil-bind margin</th>
            <th className="font-semibold" />
          </tr>
        }
      >
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
              <StackRow
                key={`${c}${valve}`}
                title={`Cylinder ${c}, ${valve}`}
                data-testid={`spring-${c}-${valve}`}
              >
                <StackCell deskOnly className="pr-3 font-mono">
                  {valve === "intake" ? c : ""}
                </StackCell>
                <StackCell deskOnly className="pr-3">
                  {VALVE_WORDS[valve]}
                </StackCell>
                {FIGURES.map(([key, words, heading]) => (
                  <StackCell key={key} label={heading} className="py-0.5 pr-3">
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
                  </StackCell>
                ))}
                <StackCell label="Seat" className="pr-3 font-mono">
                  {v ? formatLoad(v.seatLoad) : ""}
                </StackCell>
                <StackCell label="Open" className="pr-3 font-mono">
                  {v ? formatLoad(v.openLoad) : ""}
                </StackCell>
                <StackCell
                  label="Coil-bind margin"
                  className="pr-3 font-mono"
                  data-testid={`spring-margin-${c}-${valve}`}
                >
                  {v?.coilBindMargin !== undefined
                    ? formatLengthAsTyped(v.coilBindMargin, lengths)
                    : ""}
                </StackCell>
                <StackCell className="text-machine">
                  {r?.result && !r.result.ok ? r.result.refusal.message : r?.flags.join("; ")}
                </StackCell>
              </StackRow>
            );
          }),
        )}
      </StackTable>
    </BuildPanel>
  );
}
