import { DEFAULT_OUTLIER_PERCENT } from "@/lib/balance";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { findLastPairing, type PairingRecord } from "@/db/pairing";
import {
  findOutlierPercent,
  listPartTargets,
  listPartWeights,
  listRotatingRecords,
  type PartTarget,
  type PartWeight,
  type RotatingRecord,
} from "@/db/weights";
import { buildWorkshopPlan, type WorkshopPlan } from "./plan";
import { checkRotatingRecord, type RotatingCheck } from "./rotating";

export interface Workshop {
  job: Job;
  weights: PartWeight[];
  targets: PartTarget[];
  rotating: (RotatingRecord & { check: RotatingCheck })[];
  plan: WorkshopPlan;
  /** The last pairing applied or undone (undo is offered while it is an applied one). */
  lastPairing: PairingRecord | null;
  /** The shop's outlier percentage: how far from its kind a weight may sit before it is held. */
  outlierPercent: string;
}

/** Everything the bench pages show for one job, with the plan worked out from it. */
export async function loadWorkshop(db: DB, job: Job): Promise<Workshop> {
  const [weights, targets, rotating, percent, lastPairing] = await Promise.all([
    listPartWeights(db, job.id),
    listPartTargets(db, job.id),
    listRotatingRecords(db, job.id),
    findOutlierPercent(db),
    findLastPairing(db, job.id),
  ]);
  const outlierPercent = percent ?? DEFAULT_OUTLIER_PERCENT;
  return {
    job,
    weights,
    targets,
    rotating: rotating.map((r) => ({ ...r, check: checkRotatingRecord(r) })),
    plan: buildWorkshopPlan(
      job,
      weights,
      targets,
      job.spec.pairingGroups ?? undefined,
      outlierPercent,
    ),
    outlierPercent,
    lastPairing,
  };
}
