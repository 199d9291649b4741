import type { Transaction } from "kysely";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { type Job, lockExistingJob, markJobUpdated } from "@/db/jobs";
import type { Database, PartKind, WeighPhase } from "@/db/schema";
import {
  deletePartWeight,
  findOutlierPercent,
  findPartWeight,
  insertPartWeight,
  listPartTargets,
  listPartWeights,
  type PartWeight,
  updatePartWeight,
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

export interface PartWeightWrite {
  jobId: number;
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  /** Empty clears the part. */
  readings: string[];
  /** The version the writer last saw; 0 for a part not weighed yet. */
  baseVersion: number;
  /**
   * Stored with the readings: the machinist confirmed them although they sit far from the rest
   * of the kind. Every write without it clears the mark, so a changed weight is checked afresh.
   */
  confirmedOutlier?: boolean;
}

/**
 * Saves one part's readings if nobody changed them since the writer read them; every change is
 * audited with the readings before and after. Returns the saved weight (null when cleared).
 *
 * @example await savePartWeight(db, { jobId, cylinder: 1, kind: "piston", phase: "initial", readings: ["512.4"], baseVersion: 0 }, userId)
 * @throws NotFoundError when there is no such job; StaleWriteError (409) when the part changed
 *   since `baseVersion`
 */
export async function savePartWeight(
  db: DB,
  write: PartWeightWrite,
  actorId: number | null,
  now = new Date(),
): Promise<PartWeight | null> {
  return db.transaction().execute((trx) => writePartWeight(trx, write, actorId, now));
}

/**
 * Several parts at once (a CSV import): all of them, or none if any is stale.
 * @throws NotFoundError, StaleWriteError as {@link savePartWeight}
 */
export async function savePartWeights(
  db: DB,
  writes: PartWeightWrite[],
  actorId: number | null,
  now = new Date(),
): Promise<(PartWeight | null)[]> {
  return db.transaction().execute(async (trx) => {
    const saved = [];
    for (const write of writes) saved.push(await writePartWeight(trx, write, actorId, now));
    return saved;
  });
}

async function writePartWeight(
  trx: Transaction<Database>,
  write: PartWeightWrite,
  actorId: number | null,
  now: Date,
): Promise<PartWeight | null> {
  // Locked on PostgreSQL: saves of this job's parts wait their turn (db/dialect.ts, lockJob).
  if (!(await lockExistingJob(trx, write.jobId))) throw new NotFoundError("job");
  const key = {
    jobId: write.jobId,
    cylinder: write.cylinder,
    kind: write.kind,
    phase: write.phase,
  };
  const before = await findPartWeight(trx, key);
  const currentVersion = before?.version ?? 0;
  if (currentVersion !== write.baseVersion) throw new StaleWriteError("weight", currentVersion);

  const at = now.toISOString();
  let saved: PartWeight | null = null;
  if (write.readings.length === 0) {
    if (before) await deletePartWeight(trx, before.id, before.version);
  } else {
    const values = {
      readings: write.readings,
      confirmedOutlier: write.confirmedOutlier === true,
      updatedBy: actorId,
      updatedAt: at,
    };
    if (before) await updatePartWeight(trx, before.id, before.version, values);
    else await insertPartWeight(trx, key, values);
    saved = {
      cylinder: key.cylinder,
      kind: key.kind,
      phase: key.phase,
      readings: write.readings,
      confirmedOutlier: values.confirmedOutlier,
      version: currentVersion + 1,
      updatedAt: at,
    };
  }
  await createAuditEntry(trx, {
    userId: actorId,
    action: saved ? (saved.confirmedOutlier ? "weigh-confirmed" : "weigh") : "clear",
    entity: "part_weight",
    entityId: `${write.jobId}:${write.cylinder}:${write.kind}:${write.phase}`,
    before: before?.readings ?? [],
    after: saved?.readings ?? [],
  });
  await markJobUpdated(trx, write.jobId, at);
  return saved;
}
