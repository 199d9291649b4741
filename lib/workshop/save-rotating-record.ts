import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { lockJob } from "@/db/dialect";
import { StaleWriteError } from "@/db/errors";
import type { RotatingPart } from "@/db/schema";
import {
  findRotatingRecord,
  insertRotatingRecord,
  type RotatingRecord,
  updateRotatingRecord,
} from "@/db/weights";

export interface RotatingRecordWrite {
  jobId: number;
  part: RotatingPart;
  /** The record as checked by the zod schema (lib/validation/workshop.ts). */
  data: unknown;
  /** The version the writer last saw; 0 for a part not recorded yet. */
  baseVersion: number;
}

/**
 * Saves the record of one rotating part (crank, flywheel, clutch, damper) if nobody changed it
 * since the writer read it; audited with the record before and after.
 *
 * @example await saveRotatingRecord(db, { jobId, part: "crankshaft", data, baseVersion: 0 }, userId)
 * @throws StaleWriteError (409) when the record changed since `baseVersion`
 */
export async function saveRotatingRecord(
  db: DB,
  write: RotatingRecordWrite,
  actorId: number | null,
  now = new Date(),
): Promise<RotatingRecord> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, write.jobId);
    const before = await findRotatingRecord(trx, write.jobId, write.part);
    const currentVersion = before?.version ?? 0;
    if (currentVersion !== write.baseVersion) throw new StaleWriteError("record", currentVersion);
    const at = now.toISOString();
    const values = { data: write.data, updatedBy: actorId, updatedAt: at };
    if (before) await updateRotatingRecord(trx, write.jobId, write.part, before.version, values);
    else await insertRotatingRecord(trx, write.jobId, write.part, values);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "record",
      entity: "rotating_record",
      entityId: `${write.jobId}:${write.part}`,
      before: before?.data ?? null,
      after: write.data,
    });
    return { part: write.part, data: write.data, version: currentVersion + 1, updatedAt: at };
  });
}
