"use client";

import Decimal from "decimal.js";
import {
  Bar,
  BarChart,
  CartesianGrid,
  Legend,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import { formatDerivedMass, formatMass, type PartResult } from "@/lib/balance";

/** A weighed figure at the scale resolution, a mean of readings one decimal finer. */
function shown(part: PartResult, value: string, resolution: string, computed: boolean): string {
  return computed || (part.readings?.length ?? 1) > 1
    ? formatDerivedMass(value, resolution)
    : formatMass(value, resolution);
}

/** The scale step the readings were taken at, when the caller does not say: their finest decimal. */
function resolutionOf(parts: PartResult[]): string {
  const places = Math.max(
    0,
    ...parts.flatMap((p) => (p.readings ?? [p.measured]).map((r) => r.split(".")[1]?.length ?? 0)),
  );
  return places === 0 ? "1" : `0.${"0".repeat(places - 1)}1`;
}

/**
 * One kind of part per cylinder, as weighed and as finished, against the target and its band.
 * Bar heights are numbers for drawing only; every figure in words (labels, tooltips, axis) goes
 * through the display rule.
 */
export function PartChart({
  parts,
  finished,
  target,
  tolerance,
  unit,
  resolution,
}: {
  parts: PartResult[];
  finished: (PartResult | undefined)[];
  target: string;
  tolerance: string;
  unit: string;
  /** The scale resolution; without it, the finest decimal of the readings. */
  resolution?: string;
}) {
  const res = resolution ?? resolutionOf(parts);
  const rows = parts.map((p, i) => {
    const done = finished[i];
    return {
      cylinder: String(p.cylinder),
      weighed: Number(p.measured),
      finished: Number(done?.measured ?? p.final),
      weighedText: shown(p, p.measured, res, false),
      // As finished: a re-weigh, or the planned weight (worked out where metal comes off).
      finishedText: done
        ? shown(done, done.measured, res, false)
        : shown(p, p.final, res, p.final !== p.measured),
    };
  });
  const values = rows.flatMap((r) => [r.weighed, r.finished]);
  const bandTop = new Decimal(target).plus(tolerance);
  const low = Math.min(...values, Number(target));
  const high = Math.max(...values, bandTop.toNumber());
  const pad = Math.max((high - low) * 0.25, Number(tolerance));
  const { ticks, domain } = evenTicks(low - pad, high + pad, Number(res));
  const targetText = formatDerivedMass(target, res);
  const bandText = formatDerivedMass(bandTop.toString(), res);
  const tick = (v: number) => formatMass(v.toFixed(9), res);
  return (
    <figure
      aria-label={`Weights per cylinder against the target of ${targetText} ${unit} (band up to ${bandText} ${unit})`}
      className="h-56 w-full"
    >
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 0, left: 0 }}>
          <CartesianGrid strokeDasharray="3 3" stroke="#e6e8eb" />
          <XAxis dataKey="cylinder" tick={{ fontSize: 12 }} />
          <YAxis
            domain={domain}
            ticks={ticks}
            tick={{ fontSize: 11 }}
            width={52}
            tickFormatter={tick}
            allowDataOverflow
          />
          <Tooltip
            formatter={(_v, name, item) => {
              const row = item.payload as (typeof rows)[number];
              return [`${name === "Weighed" ? row.weighedText : row.finishedText} ${unit}`, name];
            }}
          />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          <ReferenceArea
            y1={Number(target)}
            y2={bandTop.toNumber()}
            fill="#2f7d4f"
            fillOpacity={0.12}
          />
          <ReferenceLine y={Number(target)} stroke="#2f7d4f" strokeDasharray="4 2" />
          <Bar dataKey="weighed" name="Weighed" fill="#a9b0b8" />
          <Bar dataKey="finished" name="Finished" fill="#9a7524" />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}

/**
 * Axis marks evenly spaced at a whole number of scale steps (about four gaps), so every mark reads
 * at the scale resolution and the gaps between the printed figures are equal.
 */
export function evenTicks(
  from: number,
  to: number,
  resolution: number,
): { ticks: number[]; domain: [number, number] } {
  const step = resolution * Math.max(1, Math.ceil((to - from) / 4 / resolution - 1e-9));
  const first = Math.floor(from / step + 1e-9) * step;
  const ticks: number[] = [];
  for (let v = first; ticks.length < 12; v += step) {
    ticks.push(Number(v.toFixed(9)));
    if (v >= to - 1e-9) break;
  }
  return { ticks, domain: [ticks[0]!, ticks[ticks.length - 1]!] };
}
