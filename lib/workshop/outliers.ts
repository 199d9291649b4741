import {
  checkPlausibility,
  DEFAULT_OUTLIER_PERCENT,
  formatDerivedMass,
  formatMass,
  formatUnbalance,
  type Plausibility,
} from "@/lib/balance";
import type { Job } from "@/db/jobs";
import type { PartKind, WeighPhase } from "@/db/schema";
import type { PartWeight } from "@/db/weights";

// The weigh-in's plausibility rule, the same for the API, the plan and the grid: a weight far
// from the rest of its kind (lib/balance/plausibility.ts) is held until the machinist confirms it.

/**
 * A part's name in a sentence, and the name of several of them: the bench's words
 * (components/workshop/part-kinds.ts) in lower case, so the grid, the history and the
 * customer summary name a part alike.
 */
export const PART_NAMES: Record<PartKind, { one: string; many: string }> = {
  piston: { one: "piston", many: "pistons" },
  wristPin: { one: "wrist pin", many: "wrist pins" },
  retainers: { one: "pin retainers", many: "pairs of pin retainers" },
  rings: { one: "ring set", many: "ring sets" },
  smallEnd: { one: "small end", many: "small ends" },
  bigEnd: { one: "big end", many: "big ends" },
  bearing: { one: "rod bearing shells", many: "sets of rod bearing shells" },
  rodTotal: { one: "whole rod", many: "whole rods" },
};

export interface WeightCheck extends Plausibility {
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  /** Says what is wrong and what to do, naming the part; null when the weight is plausible. */
  message: string | null;
  /** What was found, without the part's name: "4009 g is 10× the other pistons (median 400.75 g)". */
  finding: string | null;
}

export interface PartReadings {
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  readings: string[];
}

/**
 * What a part is compared with: the same kind on the engine's other cylinders. First weights are
 * compared with first weights; a re-weigh with the other re-weighs, or with a cylinder's first
 * weight where it has not been re-weighed yet (a machined set stays within a few percent of it).
 */
function othersOf(job: Job, weights: PartWeight[], part: PartReadings): string[][] {
  const cylinders = job.spec.cylinders ?? 0;
  const find = (cylinder: number, phase: WeighPhase) =>
    weights.find(
      (w) =>
        w.cylinder === cylinder &&
        w.kind === part.kind &&
        w.phase === phase &&
        w.readings.length > 0,
    );
  const others: string[][] = [];
  for (let c = 1; c <= cylinders; c++) {
    if (c === part.cylinder) continue;
    const found =
      part.phase === "final" ? (find(c, "final") ?? find(c, "initial")) : find(c, "initial");
    if (found) others.push(found.readings);
  }
  return others;
}

/** Checks one part's readings against the rest of its kind on the job, with the message to show. */
export function checkPartWeight(
  job: Job,
  weights: PartWeight[],
  part: PartReadings,
  percent: string = DEFAULT_OUTLIER_PERCENT,
): WeightCheck {
  const others = othersOf(job, weights, part);
  const result = checkPlausibility({
    weight: part.readings,
    others,
    percent,
    allowance: job.spec.tolerance,
  });
  const single = others.length === 1 && others[0]!.length === 1 ? others[0]![0]! : null;
  const described = result.outlier ? describeOutlier(job, part, result, single) : null;
  return {
    ...result,
    cylinder: part.cylinder,
    kind: part.kind,
    phase: part.phase,
    message: described?.message ?? null,
    finding: described?.finding ?? null,
  };
}

function describeOutlier(
  job: Job,
  part: PartReadings,
  result: Plausibility,
  singleOther: string | null,
): { message: string; finding: string } {
  const unit = job.spec.massUnit;
  const res = job.spec.scaleResolution;
  const name = PART_NAMES[part.kind];
  const subject = `Cylinder ${part.cylinder} ${name.one}${part.phase === "final" ? " (re-weigh)" : ""}`;
  const typed =
    part.readings.length === 1
      ? `${part.readings[0]} ${unit}`
      : `${formatDerivedMass(result.weight, res)} ${unit} (mean of ${part.readings.length} readings)`;
  if (result.reason === "not-positive")
    return {
      finding: `${typed} is not a weight`,
      message: `${subject}: ${typed} is not a weight. Weigh the part again and retype it.`,
    };
  const reference =
    result.basis === "median"
      ? `the other ${name.many} (median ${formatDerivedMass(result.reference!, res)} ${unit})`
      : `the other ${name.one} (${singleOther ? formatMass(singleOther, res) : formatDerivedMass(result.reference!, res)} ${unit})`;
  const ratio = Number(result.ratio);
  const deviation = result.deviationPercent!;
  const comparison =
    ratio >= 2
      ? `${formatUnbalance(result.ratio!)}× ${reference}`
      : `${formatUnbalance(deviation.replace("-", ""))} % ${deviation.startsWith("-") ? "lighter" : "heavier"} than ${reference}`;
  const hint = ratio >= 5 || ratio <= 0.2 ? " — a missed decimal point?" : ".";
  const finding = `${typed} is ${comparison}`;
  return {
    finding,
    message: `${subject}: ${finding}${hint} Confirm it if that is what the scale read, or retype it.`,
  };
}

export type OutlierCheck = WeightCheck & { confirmed: boolean };

/** Every weighed part of the job checked against the rest of its kind: the outliers only. */
export function findOutliers(job: Job, weights: PartWeight[], percent?: string): OutlierCheck[] {
  const cylinders = job.spec.cylinders ?? 0;
  return weights
    .filter((w) => w.readings.length > 0 && w.cylinder >= 1 && w.cylinder <= cylinders)
    .map((w) => ({ ...checkPartWeight(job, weights, w, percent), confirmed: w.confirmedOutlier }))
    .filter((c) => c.outlier);
}

/** Outliers the machinist has not confirmed: the plan and the card wait for them. */
export function findHeldWeights(job: Job, weights: PartWeight[], percent?: string): OutlierCheck[] {
  return findOutliers(job, weights, percent).filter((c) => !c.confirmed || c.reason !== "far");
}
