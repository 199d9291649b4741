import type { PartKind } from "@/db/schema";
import { formatDerivedMass, formatMass, type PartResult } from "@/lib/balance";
import type { Workshop } from "@/lib/workshop/load";
import { findOutliers, PART_NAMES } from "@/lib/workshop/outliers";

/** A part a card may carry only when the machinist issues it anyway, with a reason. */
export interface CardException {
  cylinder: number;
  kind: PartKind;
  /**
   * `heavy`: still over the band as finished; `light`: under a set target; `reselect`: a part the
   * trade does not machine, over the band; `outlier`: a weight far from the rest of its kind that
   * the machinist confirmed as read; `other`: any other status the engine gives.
   */
  reason: "heavy" | "light" | "reselect" | "outlier" | "other";
  /** As printed: "cylinder 3 piston 0.80 g heavy, over the band". */
  text: string;
}

function weighed(part: PartResult, resolution: string): string {
  return part.readings && part.readings.length > 1
    ? formatDerivedMass(part.measured, resolution)
    : formatMass(part.measured, resolution);
}

/**
 * Everything about the finished set that a balance card should not carry without a word: parts
 * still over the band, light parts, parts to re-select, and outliers confirmed as read. Empty
 * when the plan is not worked out (the card is refused for that reason first).
 */
export function cardExceptions(workshop: Workshop): CardException[] {
  const { plan, job } = workshop;
  const finished = plan.finished;
  if (!plan.complete || !finished) return [];
  const unit = finished.unit;
  const res = finished.resolution;
  const found: CardException[] = [];
  for (const part of finished.parts) {
    if (part.status === "ok") continue;
    const kind = part.kind as PartKind;
    const subject = `cylinder ${part.cylinder} ${PART_NAMES[kind]?.one ?? part.kind}`;
    const target = finished.targets[part.kind as keyof typeof finished.targets];
    const against = target
      ? `${weighed(part, res)} ${unit} against the target ${formatDerivedMass(target, res)} ${unit}`
      : `${weighed(part, res)} ${unit}`;
    const status: string = part.status;
    if (status === "remove")
      found.push({
        cylinder: part.cylinder,
        kind,
        reason: "heavy",
        text: `${subject} ${formatDerivedMass(part.remove, res)} ${unit} heavy, over the band (${against})`,
      });
    else if (status === "light")
      found.push({
        cylinder: part.cylinder,
        kind,
        reason: "light",
        text: `${subject} light (${against})`,
      });
    else if (status === "reselect")
      found.push({
        cylinder: part.cylinder,
        kind,
        reason: "reselect",
        text: `${subject} over the band, to re-select or replace (${against})`,
      });
    else
      found.push({
        cylinder: part.cylinder,
        kind,
        reason: "other",
        text: `${subject} not within the band (${against})`,
      });
  }
  for (const outlier of findOutliers(job, workshop.weights, workshop.outlierPercent)) {
    if (!outlier.confirmed || !outlier.finding) continue;
    const name = PART_NAMES[outlier.kind].one;
    found.push({
      cylinder: outlier.cylinder,
      kind: outlier.kind,
      reason: "outlier",
      text: `cylinder ${outlier.cylinder} ${name}${outlier.phase === "final" ? " (re-weigh)" : ""} ${outlier.finding}, confirmed as read`,
    });
  }
  return found;
}

/** The sentence the card and the refusal use. */
export function describeExceptions(exceptions: CardException[]): string {
  return exceptions.map((e) => e.text).join("; ");
}
