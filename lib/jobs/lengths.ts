import type { JobSpec } from "@/db/jobs";
import { convertLength, formatLength } from "@/lib/balance";

export type JobLength = "bore" | "stroke" | "rodLength";

const COLUMNS = {
  bore: { mm: "boreMm", entered: "boreEntered" },
  stroke: { mm: "strokeMm", entered: "strokeEntered" },
  rodLength: { mm: "rodLengthMm", entered: "rodLengthEntered" },
} as const;

type LengthSpec = Pick<
  JobSpec,
  | "lengthUnit"
  | "boreMm"
  | "strokeMm"
  | "rodLengthMm"
  | "boreEntered"
  | "strokeEntered"
  | "rodLengthEntered"
>;

/**
 * A job length as the machinist typed it, in the job's length unit ("4.030"); a length stored
 * only in mm is converted (1 in = 25.4 mm) and shown to at most four decimals. Null: not known.
 */
export function lengthAsEntered(spec: LengthSpec, which: JobLength): string | null {
  const c = COLUMNS[which];
  const entered = spec[c.entered];
  if (entered) return entered;
  const mm = spec[c.mm];
  if (!mm) return null;
  return formatLength(spec.lengthUnit === "in" ? convertLength(mm, "mm", "in") : mm);
}

/** "4.030 in", "92.00 mm", or null when the length is not known. */
export function showLength(spec: LengthSpec, which: JobLength): string | null {
  const value = lengthAsEntered(spec, which);
  return value === null ? null : `${value} ${spec.lengthUnit}`;
}

/** The drill size as written ("3/8\"", "#21") or its diameter in mm; null when none is set. */
export function showDrillSize(spec: Pick<JobSpec, "drillSize" | "drillDiameterMm">): string | null {
  if (spec.drillSize) return spec.drillSize;
  return spec.drillDiameterMm ? `${formatLength(spec.drillDiameterMm)} mm` : null;
}
