import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { PartKind, WeighPhase } from "@/db/schema";
import {
  findOutlierPercent,
  listPartTargets,
  listPartWeights,
  type PartWeight,
  savePartWeight,
} from "@/db/weights";
import { DEFAULT_OUTLIER_PERCENT } from "@/lib/balance";
import { HttpError } from "@/lib/http/errors";
import { checkPartWeight } from "./outliers";
import { buildWorkshopPlan, type WorkshopPlan } from "./plan";

export interface WeighingInput {
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  /** Empty clears the part. Zero readings are refused by the schema before this is called. */
  readings: string[];
  /** The version the writer last saw; 0 for a part not weighed yet. */
  version: number;
  /** The machinist has seen the outlier message and keeps the readings. */
  confirmOutlier?: boolean;
}

/**
 * Saves one part's readings from the weigh-in, holding a likely typing slip first.
 *
 * Readings far from the rest of their kind (lib/workshop/outliers.ts: more than the shop's
 * percentage from the median, 5 % unless set) are refused with a 422 of code `outlier` whose
 * message names the part, the median and what to do; the same readings sent again with
 * `confirmOutlier: true` are saved and marked confirmed. `confirmOutlier` on readings that are
 * not an outlier is accepted and stores no mark: there is nothing to confirm. Any later write
 * without it clears the mark, so a changed weight is checked afresh.
 *
 * The answer is cheap: the saved weight and the plan worked out once, without the rotating-part
 * records and the piston-to-rod pairing search
 * (`plan.pairingDeferred`; GET /api/jobs/:id/workshop has the pairing).
 *
 * @throws HttpError 422 `invalid_input` for a cylinder the engine does not have, 422 `outlier`
 *   for unconfirmed outlying readings; StaleWriteError (409) when the part changed since `version`
 */
export async function saveWeighing(
  db: DB,
  job: Job,
  input: WeighingInput,
  actorId: number,
): Promise<{ weight: PartWeight | null; plan: WorkshopPlan }> {
  if (input.cylinder > (job.spec.cylinders ?? 0)) {
    throw new HttpError(422, "invalid_input", "This engine has no such cylinder.", {
      cylinder: "This engine has no such cylinder.",
    });
  }
  let confirmedOutlier = false;
  const [weights, percent, targets] = await Promise.all([
    listPartWeights(db, job.id),
    findOutlierPercent(db),
    listPartTargets(db, job.id),
  ]);
  const outlierPercent = percent ?? DEFAULT_OUTLIER_PERCENT;
  if (input.readings.length > 0) {
    const check = checkPartWeight(job, weights, input, outlierPercent);
    if (check.outlier && check.message) {
      if (!input.confirmOutlier) {
        throw new HttpError(422, "outlier", check.message, { readings: check.message });
      }
      confirmedOutlier = check.reason === "far";
    }
  }
  const weight = await savePartWeight(
    db,
    {
      jobId: job.id,
      cylinder: input.cylinder,
      kind: input.kind,
      phase: input.phase,
      readings: input.readings,
      baseVersion: input.version,
      confirmedOutlier,
    },
    actorId,
  );
  // Read again: another bench may have saved a part meanwhile, and the plan must show it.
  const plan = buildWorkshopPlan(
    job,
    await listPartWeights(db, job.id),
    targets,
    job.spec.pairingGroups ?? undefined,
    outlierPercent,
    { pairing: false },
  );
  return { weight, plan };
}
