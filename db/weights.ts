import type { Kysely, Transaction } from "kysely";
import { createAuditEntry } from "./audit";
import { forUpdate, lockJob } from "./dialect";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database, PartKind, RotatingPart, WeighPhase } from "./schema";

/** One part's readings off the scale (decimal strings in the job's unit), first weigh or after machining. */
export interface PartWeight {
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
  readings: string[];
  /** The machinist confirmed these readings although they sit far from the rest of the kind. */
  confirmedOutlier: boolean;
  version: number;
  updatedAt: string;
}

export async function listPartWeights(db: Kysely<Database>, jobId: number): Promise<PartWeight[]> {
  const rows = await db
    .selectFrom("part_weights")
    .selectAll()
    .where("job_id", "=", jobId)
    .orderBy("phase")
    .orderBy("kind")
    .orderBy("cylinder")
    .execute();
  return rows.map((r) => ({
    cylinder: r.cylinder,
    kind: r.kind,
    phase: r.phase,
    readings: JSON.parse(r.readings_json) as string[],
    confirmedOutlier: r.confirmed_outlier === 1,
    version: r.version,
    updatedAt: r.updated_at,
  }));
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

/** The shop's outlier percentage (shop_settings.outlier_percent), or null before any settings are saved. */
export async function findOutlierPercent(db: Kysely<Database>): Promise<string | null> {
  const row = await db
    .selectFrom("shop_settings")
    .select("outlier_percent")
    .where("id", "=", 1)
    .executeTakeFirst();
  return row?.outlier_percent ?? null;
}

/**
 * Saves one part's readings if nobody changed them since the writer read them; every change is
 * audited with the readings before and after. Returns the saved weight (null when cleared).
 */
export async function savePartWeight(
  db: Kysely<Database>,
  write: PartWeightWrite,
  actorId: number | null,
  now = new Date(),
): Promise<PartWeight | null> {
  return db.transaction().execute((trx) => writePartWeight(trx, write, actorId, now));
}

/** Several parts at once (a CSV import): all of them, or none if any is stale. */
export async function savePartWeights(
  db: Kysely<Database>,
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
  const job = await trx
    .selectFrom("jobs")
    .select("id")
    .where("id", "=", write.jobId)
    .$call(forUpdate(trx))
    .executeTakeFirst();
  if (!job) throw new NotFoundError("job");
  const key = {
    job_id: write.jobId,
    cylinder: write.cylinder,
    kind: write.kind,
    phase: write.phase,
  };
  const before = await trx
    .selectFrom("part_weights")
    .selectAll()
    .where("job_id", "=", key.job_id)
    .where("cylinder", "=", key.cylinder)
    .where("kind", "=", key.kind)
    .where("phase", "=", key.phase)
    .executeTakeFirst();
  const currentVersion = before?.version ?? 0;
  if (currentVersion !== write.baseVersion) throw new StaleWriteError("weight", currentVersion);

  const at = now.toISOString();
  const entityId = `${write.jobId}:${write.cylinder}:${write.kind}:${write.phase}`;
  const beforeReadings = before ? (JSON.parse(before.readings_json) as string[]) : [];
  let saved: PartWeight | null = null;
  if (write.readings.length === 0) {
    if (before) await trx.deleteFrom("part_weights").where("id", "=", before.id).execute();
  } else {
    const readings_json = JSON.stringify(write.readings);
    const confirmed_outlier = write.confirmedOutlier ? 1 : 0;
    const version = currentVersion + 1;
    if (before) {
      await trx
        .updateTable("part_weights")
        .set({ readings_json, confirmed_outlier, version, updated_by: actorId, updated_at: at })
        .where("id", "=", before.id)
        .execute();
    } else {
      await trx
        .insertInto("part_weights")
        .values({
          ...key,
          readings_json,
          confirmed_outlier,
          version,
          updated_by: actorId,
          updated_at: at,
        })
        .execute();
    }
    saved = {
      cylinder: key.cylinder,
      kind: key.kind,
      phase: key.phase,
      readings: write.readings,
      confirmedOutlier: confirmed_outlier === 1,
      version,
      updatedAt: at,
    };
  }
  await createAuditEntry(trx, {
    userId: actorId,
    action: saved ? (saved.confirmedOutlier ? "weigh-confirmed" : "weigh") : "clear",
    entity: "part_weight",
    entityId,
    before: beforeReadings,
    after: saved?.readings ?? [],
  });
  await trx.updateTable("jobs").set({ updated_at: at }).where("id", "=", write.jobId).execute();
  return saved;
}

export interface PartTarget {
  kind: PartKind;
  target: string | null;
  version: number;
}

export async function listPartTargets(db: Kysely<Database>, jobId: number): Promise<PartTarget[]> {
  const rows = await db
    .selectFrom("part_targets")
    .selectAll()
    .where("job_id", "=", jobId)
    .execute();
  return rows.map((r) => ({ kind: r.kind, target: r.target, version: r.version }));
}

/** Sets or clears (null: back to the lightest part) the target for one kind of part. */
export async function savePartTarget(
  db: Kysely<Database>,
  write: { jobId: number; kind: PartKind; target: string | null; baseVersion: number },
  actorId: number | null,
): Promise<PartTarget> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, write.jobId);
    const before = await trx
      .selectFrom("part_targets")
      .selectAll()
      .where("job_id", "=", write.jobId)
      .where("kind", "=", write.kind)
      .executeTakeFirst();
    const currentVersion = before?.version ?? 0;
    if (currentVersion !== write.baseVersion) throw new StaleWriteError("target", currentVersion);
    const version = currentVersion + 1;
    await trx
      .insertInto("part_targets")
      .values({ job_id: write.jobId, kind: write.kind, target: write.target, version })
      .onConflict((oc) =>
        oc.columns(["job_id", "kind"]).doUpdateSet({ target: write.target, version }),
      )
      .execute();
    await createAuditEntry(trx, {
      userId: actorId,
      action: "set-target",
      entity: "part_target",
      entityId: `${write.jobId}:${write.kind}`,
      before: before?.target ?? null,
      after: write.target,
    });
    return { kind: write.kind, target: write.target, version };
  });
}

export interface RotatingRecord<T = unknown> {
  part: RotatingPart;
  data: T;
  version: number;
  updatedAt: string;
}

export async function listRotatingRecords(
  db: Kysely<Database>,
  jobId: number,
): Promise<RotatingRecord[]> {
  const rows = await db
    .selectFrom("rotating_records")
    .selectAll()
    .where("job_id", "=", jobId)
    .orderBy("part")
    .execute();
  return rows.map((r) => ({
    part: r.part,
    data: JSON.parse(r.data_json) as unknown,
    version: r.version,
    updatedAt: r.updated_at,
  }));
}

/** Saves the record of one rotating part (crank, flywheel, clutch, damper) with a version check. */
export async function saveRotatingRecord(
  db: Kysely<Database>,
  write: { jobId: number; part: RotatingPart; data: unknown; baseVersion: number },
  actorId: number | null,
  now = new Date(),
): Promise<RotatingRecord> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, write.jobId);
    const before = await trx
      .selectFrom("rotating_records")
      .selectAll()
      .where("job_id", "=", write.jobId)
      .where("part", "=", write.part)
      .executeTakeFirst();
    const currentVersion = before?.version ?? 0;
    if (currentVersion !== write.baseVersion) throw new StaleWriteError("record", currentVersion);
    const version = currentVersion + 1;
    const at = now.toISOString();
    const data_json = JSON.stringify(write.data);
    await trx
      .insertInto("rotating_records")
      .values({
        job_id: write.jobId,
        part: write.part,
        data_json,
        version,
        updated_by: actorId,
        updated_at: at,
      })
      .onConflict((oc) =>
        oc
          .columns(["job_id", "part"])
          .doUpdateSet({ data_json, version, updated_by: actorId, updated_at: at }),
      )
      .execute();
    await createAuditEntry(trx, {
      userId: actorId,
      action: "record",
      entity: "rotating_record",
      entityId: `${write.jobId}:${write.part}`,
      before: before ? (JSON.parse(before.data_json) as unknown) : null,
      after: write.data,
    });
    return { part: write.part, data: write.data, version, updatedAt: at };
  });
}
