import type { Kysely, Selectable, Transaction } from "kysely";
import { StaleWriteError } from "./errors";
import type { Database, PartKind, PartWeightTable, RotatingPart, WeighPhase } from "./schema";

// Weights, targets and rotating-part records of a job: the queries only. The saves (the job's
// lock, the version a writer read, the audit entry, the one transaction) are lib/workshop's.

type Db = Kysely<Database> | Transaction<Database>;

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

function toPartWeight(r: Selectable<PartWeightTable>): PartWeight {
  return {
    cylinder: r.cylinder,
    kind: r.kind,
    phase: r.phase,
    readings: JSON.parse(r.readings_json) as string[],
    confirmedOutlier: r.confirmed_outlier === 1,
    version: r.version,
    updatedAt: r.updated_at,
  };
}

export async function listPartWeights(db: Db, jobId: number): Promise<PartWeight[]> {
  const rows = await db
    .selectFrom("part_weights")
    .selectAll()
    .where("job_id", "=", jobId)
    .orderBy("phase")
    .orderBy("kind")
    .orderBy("cylinder")
    .execute();
  return rows.map(toPartWeight);
}

/** Which part and phase a weight is: one row per job, cylinder, kind and phase. */
export interface PartWeightKey {
  jobId: number;
  cylinder: number;
  kind: PartKind;
  phase: WeighPhase;
}

/** A stored weight with its row id, as a writer reads it before changing it. */
export interface StoredPartWeight extends PartWeight {
  id: number;
}

/** What a weight write stores besides its key. */
export interface PartWeightValues {
  readings: string[];
  confirmedOutlier: boolean;
  updatedBy: number | null;
  updatedAt: string;
}

/** The shop's outlier percentage (shop_settings.outlier_percent), or null before any settings are saved. */
export async function findOutlierPercent(db: Db): Promise<string | null> {
  const row = await db
    .selectFrom("shop_settings")
    .select("outlier_percent")
    .where("id", "=", 1)
    .executeTakeFirst();
  return row?.outlier_percent ?? null;
}

/** One part's stored weight in one phase, or undefined when it is not weighed. */
export async function findPartWeight(
  db: Db,
  key: PartWeightKey,
): Promise<StoredPartWeight | undefined> {
  const row = await db
    .selectFrom("part_weights")
    .selectAll()
    .where("job_id", "=", key.jobId)
    .where("cylinder", "=", key.cylinder)
    .where("kind", "=", key.kind)
    .where("phase", "=", key.phase)
    .executeTakeFirst();
  return row && { id: row.id, ...toPartWeight(row) };
}

/** Stores a part's first weight in a phase, at version 1. */
export async function insertPartWeight(
  db: Db,
  key: PartWeightKey,
  values: PartWeightValues,
): Promise<void> {
  await db
    .insertInto("part_weights")
    .values({
      job_id: key.jobId,
      cylinder: key.cylinder,
      kind: key.kind,
      phase: key.phase,
      readings_json: JSON.stringify(values.readings),
      confirmed_outlier: values.confirmedOutlier ? 1 : 0,
      version: 1,
      updated_by: values.updatedBy,
      updated_at: values.updatedAt,
    })
    .execute();
}

async function currentWeightVersion(db: Db, id: number): Promise<number> {
  const row = await db
    .selectFrom("part_weights")
    .select("version")
    .where("id", "=", id)
    .executeTakeFirst();
  return row?.version ?? 0;
}

/**
 * Writes a stored weight's readings if it is still at `version`, and moves it to the next one.
 * @throws StaleWriteError when someone else wrote (or cleared) it since `version` was read
 */
export async function updatePartWeight(
  db: Db,
  id: number,
  version: number,
  values: PartWeightValues,
): Promise<void> {
  const result = await db
    .updateTable("part_weights")
    .set({
      readings_json: JSON.stringify(values.readings),
      confirmed_outlier: values.confirmedOutlier ? 1 : 0,
      version: version + 1,
      updated_by: values.updatedBy,
      updated_at: values.updatedAt,
    })
    .where("id", "=", id)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numUpdatedRows) === 0) {
    throw new StaleWriteError("weight", await currentWeightVersion(db, id));
  }
}

/**
 * Removes a stored weight if it is still at `version`.
 * @throws StaleWriteError when someone else wrote it since `version` was read
 */
export async function deletePartWeight(db: Db, id: number, version: number): Promise<void> {
  const result = await db
    .deleteFrom("part_weights")
    .where("id", "=", id)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numDeletedRows) === 0) {
    throw new StaleWriteError("weight", await currentWeightVersion(db, id));
  }
}

export interface PartTarget {
  kind: PartKind;
  target: string | null;
  version: number;
}

export async function listPartTargets(db: Db, jobId: number): Promise<PartTarget[]> {
  const rows = await db
    .selectFrom("part_targets")
    .selectAll()
    .where("job_id", "=", jobId)
    .execute();
  return rows.map((r) => ({ kind: r.kind, target: r.target, version: r.version }));
}

/** One kind's target on a job, or undefined when none was ever set. */
export async function findPartTarget(
  db: Db,
  jobId: number,
  kind: PartKind,
): Promise<PartTarget | undefined> {
  const row = await db
    .selectFrom("part_targets")
    .selectAll()
    .where("job_id", "=", jobId)
    .where("kind", "=", kind)
    .executeTakeFirst();
  return row && { kind: row.kind, target: row.target, version: row.version };
}

/** Stores the first target of a kind on a job, at version 1. */
export async function insertPartTarget(
  db: Db,
  jobId: number,
  kind: PartKind,
  target: string | null,
): Promise<void> {
  await db.insertInto("part_targets").values({ job_id: jobId, kind, target, version: 1 }).execute();
}

/**
 * Writes a kind's target if it is still at `version`, and moves it to the next one.
 * @throws StaleWriteError when someone else set it since `version` was read
 */
export async function updatePartTarget(
  db: Db,
  jobId: number,
  kind: PartKind,
  version: number,
  target: string | null,
): Promise<void> {
  const result = await db
    .updateTable("part_targets")
    .set({ target, version: version + 1 })
    .where("job_id", "=", jobId)
    .where("kind", "=", kind)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numUpdatedRows) === 0) {
    throw new StaleWriteError("target", (await findPartTarget(db, jobId, kind))?.version ?? 0);
  }
}

export interface RotatingRecord<T = unknown> {
  part: RotatingPart;
  data: T;
  version: number;
  updatedAt: string;
}

export async function listRotatingRecords(db: Db, jobId: number): Promise<RotatingRecord[]> {
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

/** One rotating part's record on a job, or undefined when it was never recorded. */
export async function findRotatingRecord(
  db: Db,
  jobId: number,
  part: RotatingPart,
): Promise<RotatingRecord | undefined> {
  const row = await db
    .selectFrom("rotating_records")
    .selectAll()
    .where("job_id", "=", jobId)
    .where("part", "=", part)
    .executeTakeFirst();
  return (
    row && {
      part: row.part,
      data: JSON.parse(row.data_json) as unknown,
      version: row.version,
      updatedAt: row.updated_at,
    }
  );
}

/** What a rotating-part record write stores besides its job and part. */
export interface RotatingRecordValues {
  data: unknown;
  updatedBy: number | null;
  updatedAt: string;
}

/** Stores the first record of a rotating part on a job, at version 1. */
export async function insertRotatingRecord(
  db: Db,
  jobId: number,
  part: RotatingPart,
  values: RotatingRecordValues,
): Promise<void> {
  await db
    .insertInto("rotating_records")
    .values({
      job_id: jobId,
      part,
      data_json: JSON.stringify(values.data),
      version: 1,
      updated_by: values.updatedBy,
      updated_at: values.updatedAt,
    })
    .execute();
}

/**
 * Writes a rotating part's record if it is still at `version`, and moves it to the next one.
 * @throws StaleWriteError when someone else recorded it since `version` was read
 */
export async function updateRotatingRecord(
  db: Db,
  jobId: number,
  part: RotatingPart,
  version: number,
  values: RotatingRecordValues,
): Promise<void> {
  const result = await db
    .updateTable("rotating_records")
    .set({
      data_json: JSON.stringify(values.data),
      version: version + 1,
      updated_by: values.updatedBy,
      updated_at: values.updatedAt,
    })
    .where("job_id", "=", jobId)
    .where("part", "=", part)
    .where("version", "=", version)
    .executeTakeFirst();
  if (Number(result.numUpdatedRows) === 0) {
    throw new StaleWriteError("record", (await findRotatingRecord(db, jobId, part))?.version ?? 0);
  }
}
