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
import type { PartResult } from "@/lib/balance";

/**
 * One kind of part per cylinder, as weighed and as finished, against the target and its band.
 * Chart values are numbers for drawing only; every figure shown in words stays exact.
 */
export function PartChart({
  parts,
  finished,
  target,
  tolerance,
  unit,
}: {
  parts: PartResult[];
  finished: (PartResult | undefined)[];
  target: string;
  tolerance: string;
  unit: string;
}) {
  const rows = parts.map((p, i) => ({
    cylinder: String(p.cylinder),
    weighed: Number(p.measured),
    finished: Number(finished[i]?.measured ?? p.final),
  }));
  const values = rows.flatMap((r) => [r.weighed, r.finished]);
  const bandTop = new Decimal(target).plus(tolerance).toNumber();
  const low = Math.min(...values, Number(target));
  const high = Math.max(...values, bandTop);
  const pad = Math.max((high - low) * 0.25, Number(tolerance));
  return (
    <figure
      aria-label={`Weights per cylinder against the target of ${target} ${unit}`}
      className="h-56 w-full"
    >
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 0, left: 0 }}>
          <CartesianGrid strokeDasharray="3 3" stroke="#e6e8eb" />
          <XAxis dataKey="cylinder" tick={{ fontSize: 12 }} />
          <YAxis
            domain={[low - pad, high + pad]}
            tick={{ fontSize: 11 }}
            width={52}
            tickFormatter={(v: number) => v.toFixed(1)}
            allowDataOverflow
          />
          <Tooltip formatter={(v) => `${v} ${unit}`} />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          <ReferenceArea y1={Number(target)} y2={bandTop} fill="#2f7d4f" fillOpacity={0.12} />
          <ReferenceLine y={Number(target)} stroke="#2f7d4f" strokeDasharray="4 2" />
          <Bar dataKey="weighed" name="Weighed" fill="#a9b0b8" />
          <Bar dataKey="finished" name="Finished" fill="#9a7524" />
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
