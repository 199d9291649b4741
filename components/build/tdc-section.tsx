"use client";

import { formatAngle } from "@/lib/build-record/format";
import { bindSection, BuildPanel, LabelledCell, typed } from "./cells";
import type { SectionProps } from "./use-build-record";

/** True TDC with a piston stop: the two wheel readings and where the pointer should read 0. */
export function TdcSection(props: SectionProps) {
  const { editor, results } = props;
  const b = bindSection(props, "tdc");
  const tdc = editor.data.tdc;
  const result = results.tdc;
  return (
    <BuildPanel
      {...b.panel}
      title="True TDC (piston stop)"
      note="Turn the crank until the piston touches the stop, read the wheel, turn back to the stop and read again. After TDC positive, before TDC negative."
    >
      <div className="space-y-2">
        {(
          [
            ["firstStop", "First stop reading"],
            ["secondStop", "Second stop reading"],
          ] as const
        ).map(([key, label]) => (
          <LabelledCell
            key={key}
            label={label}
            unit="°"
            inputMode="text"
            value={tdc[key]}
            onChange={(v) => editor.update("tdc", (t) => ({ ...t, [key]: typed(v) }))}
            onCommit={b.commit}
            error={b.error(key)}
            {...b.ro}
          />
        ))}
        <p className="text-sm" data-testid="tdc-result">
          {result === null
            ? ""
            : !result.ok
              ? result.refusal.message
              : Number(result.value.offset) === 0
                ? `The pointer already reads true TDC; each stop reads ${formatAngle(result.value.eachSide)}°.`
                : `At true TDC the wheel reads ${formatAngle(result.value.offset.replace("-", ""))}° ${Number(result.value.offset) > 0 ? "ATDC" : "BTDC"}: move the pointer so it reads 0 there; each stop then reads ${formatAngle(result.value.eachSide)}°.`}
        </p>
      </div>
    </BuildPanel>
  );
}
