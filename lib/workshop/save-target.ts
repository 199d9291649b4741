import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { lockJob } from "@/db/dialect";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { findJobById } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import { findPartTarget, insertPartTarget, type PartTarget, updatePartTarget } from "@/db/weights";
import { loadWorkshop } from "./load";
import type { WorkshopPlan } from "./plan";

export interface PartTargetWrite {
  jobId: number;
  kind: PartKind;
  /** In the job's mass unit; null: back to the lightest part. */
  target: string | null;
  /** The version the writer last saw; 0 for a kind with no target yet. */
  baseVersion: number;
}

/**
 * Sets or clears (null: back to the lightest part) the target for one kind of part, if nobody
 * changed it since the writer read it; audited with the target before and after. Answers the
 * target as saved (with its new version) and the job's plan worked out with it.
 *
 * @example const { target, plan } = await savePartTarget(db, { jobId, kind: "piston", target: "512.0", baseVersion: 0 }, userId)
 * @throws StaleWriteError (409) when the target changed since `baseVersion`;
 *   NotFoundError when there is no such job
 */
export async function savePartTarget(
  db: DB,
  write: PartTargetWrite,
  actorId: number | null,
): Promise<{ target: PartTarget; plan: WorkshopPlan }> {
  const target = await db.transaction().execute(async (trx): Promise<PartTarget> => {
    await lockJob(trx, write.jobId);
    const before = await findPartTarget(trx, write.jobId, write.kind);
    const currentVersion = before?.version ?? 0;
    if (currentVersion !== write.baseVersion) throw new StaleWriteError("target", currentVersion);
    if (before) await updatePartTarget(trx, write.jobId, write.kind, before.version, write.target);
    else await insertPartTarget(trx, write.jobId, write.kind, write.target);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "set-target",
      entity: "part_target",
      entityId: `${write.jobId}:${write.kind}`,
      before: before?.target ?? null,
      after: write.target,
    });
    return { kind: write.kind, target: write.target, version: currentVersion + 1 };
  });
  const job = await findJobById(db, write.jobId);
  if (!job) throw new NotFoundError("job");
  return { target, plan: (await loadWorkshop(db, job)).plan };
}
