"use client";

import { formatAngle } from "@/lib/build-record/format";
import type { BuildRecordData } from "@/lib/build-record/schemas";
import {
  bindSection,
  BuildPanel,
  Cell,
  LabelledCell,
  StackCell,
  StackRow,
  StackTable,
  typed,
} from "./cells";
import type { SectionProps } from "./use-build-record";

type Check = BuildRecordData["cam"]["checks"][number];

/**
 * Cam checks by the intake centreline at equal lift: every check kept, each with its "crank
 * turned twice, TDC re-checked" tick, its centreline and how far to move the cam.
 */
export function CamSection(props: SectionProps) {
  const { editor, results, settings, readOnly } = props;
  const b = bindSection(props, "cam");
  const cam = editor.data.cam;
  const unit = editor.data.specs.lengthUnit;
  const setCheck = (i: number, change: Partial<Check>) =>
    editor.update("cam", (c) => ({
      ...c,
      checks: c.checks.map((k, j) => (j === i ? { ...k, ...change } : k)),
    }));
  const addCheck = () => {
    editor.update("cam", (c) => ({
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
  };

  return (
    <BuildPanel
      {...b.panel}
      title="Cam checks (intake centreline, equal lift)"
      note="Read the crank angle at the same lift on each side of full lift, turning the engine in its normal direction. Check two or three times, turning the crank twice and re-checking TDC before each."
    >
      <div className="space-y-2">
        <LabelledCell
          label="Checking lift"
          unit={unit}
          value={cam.lift}
          placeholder={
            settings.camCheckLift && settings.lengthUnit === unit
              ? settings.camCheckLift
              : undefined
          }
          onChange={(v) => editor.update("cam", (c) => ({ ...c, lift: typed(v) }))}
          onCommit={b.commit}
          error={b.error("lift")}
          {...b.ro}
        />
        <p className="text-sm text-graphite-600">
          Install at{" "}
          {results.installCentreline
            ? `${formatAngle(results.installCentreline)}° ATDC`
            : "— (enter the cam card)"}
        </p>
        <StackTable
          head={
            <tr className="text-left text-graphite-500">
              <th className="pr-2 font-semibold">#</th>
              <th className="pr-2 font-semibold">Opening side (° ATDC)</th>
              <th className="pr-2 font-semibold">Closing side (° ATDC)</th>
              <th className="pr-2 font-semibold">Final</th>
              <th className="pr-2 font-semibold">Centreline</th>
              <th className="font-semibold">Move</th>
            </tr>
          }
        >
          {cam.checks.map((check, i) => {
            const r = results.cam[i];
            const cl = r?.centreline;
            const corr = r?.correction;
            return (
              <StackRow key={i} title={`Check ${i + 1}`} data-testid={`cam-check-${i + 1}`}>
                <StackCell deskOnly className="pr-2 font-mono">
                  {i + 1}
                </StackCell>
                {(["openingSide", "closingSide"] as const).map((side) => (
                  <StackCell
                    key={side}
                    label={`${side === "openingSide" ? "Opening" : "Closing"} side (° ATDC)`}
                    className="py-0.5 pr-2"
                  >
                    <Cell
                      label={`Check ${i + 1} ${side === "openingSide" ? "opening" : "closing"} side (° ATDC)`}
                      inputMode="text"
                      className="w-20"
                      value={check[side]}
                      onChange={(v) => setCheck(i, { [side]: typed(v) })}
                      onCommit={b.commit}
                      error={b.error(`checks.${i}.${side}`)}
                      {...b.ro}
                    />
                  </StackCell>
                ))}
                <StackCell label="Final" className="pr-2 text-center">
                  <input
                    type="checkbox"
                    aria-label={`Check ${i + 1}: crank turned twice, TDC re-checked`}
                    title="Crank turned twice, TDC re-checked"
                    checked={check.final}
                    disabled={readOnly}
                    onChange={(e) => {
                      setCheck(i, { final: e.target.checked });
                      b.commit();
                    }}
                  />
                </StackCell>
                <StackCell label="Centreline" className="pr-2 font-mono">
                  {cl?.ok ? `${formatAngle(cl.value.centreline)}°` : ""}
                </StackCell>
                <StackCell label="Move" data-testid={`cam-move-${i + 1}`}>
                  {cl && !cl.ok
                    ? cl.refusal.message
                    : corr?.ok
                      ? corr.value.direction === "none"
                        ? "On the card"
                        : `${cl?.ok && cl.value.phasing ? `${formatAngle(cl.value.advance!.replace("-", ""))}° ${cl.value.phasing}: ` : ""}${corr.value.direction === "advance" ? "advance" : "retard"} the cam ${formatAngle(corr.value.move)}° (${formatAngle(corr.value.camDegrees, 2)}° at the sprocket)`
                      : ""}
                </StackCell>
              </StackRow>
            );
          })}
        </StackTable>
        {!readOnly ? (
          <button type="button" className="btn-secondary py-1 text-sm" onClick={addCheck}>
            Add a check
          </button>
        ) : null}
      </div>
    </BuildPanel>
  );
}
