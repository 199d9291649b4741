import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import type { BuildRequestState } from "./build-record-schema";
import { lockJob } from "./dialect";
import { NotFoundError, StaleWriteError } from "./errors";
import type { Database } from "./schema";

// All SQL of the engine build record: the customer's requests for the build, the record's
// sections and the shop's build settings. The rules live in lib/build-record.

type Db = Kysely<Database>;

export interface BuildRequest {
  id: number;
  jobId: number;
  text: string;
  state: BuildRequestState;
  note: string | null;
  version: number;
  createdBy: string | null;
  createdAt: string;
  updatedBy: string | null;
  updatedAt: string;
}

function selectRequests(db: Db) {
  return db
    .selectFrom("build_requests")
    .leftJoin("users as creator", "creator.id", "build_requests.created_by")
    .leftJoin("users as updater", "updater.id", "build_requests.updated_by")
    .selectAll("build_requests")
    .select(["creator.name as creator_name", "updater.name as updater_name"]);
}

type RequestRow = Awaited<ReturnType<ReturnType<typeof selectRequests>["executeTakeFirstOrThrow"]>>;

function toRequest(row: RequestRow): BuildRequest {
  return {
    id: row.id,
    jobId: row.job_id,
    text: row.text,
    state: row.state,
    note: row.note,
    version: row.version,
    createdBy: row.creator_name,
    createdAt: row.created_at,
    updatedBy: row.updater_name,
    updatedAt: row.updated_at,
  };
}

/** A job's requests for the build, in the order they were added. */
export async function listBuildRequests(db: Db, jobId: number): Promise<BuildRequest[]> {
  const rows = await selectRequests(db)
    .where("build_requests.job_id", "=", jobId)
    .orderBy("build_requests.id")
    .execute();
  return rows.map(toRequest);
}

/** The requests of a job that are neither ticked done nor explained. */
export async function listOpenBuildRequests(db: Db, jobId: number): Promise<BuildRequest[]> {
  const rows = await selectRequests(db)
    .where("build_requests.job_id", "=", jobId)
    .where("build_requests.state", "=", "open")
    .orderBy("build_requests.id")
    .execute();
  return rows.map(toRequest);
}

/** Adds a request to a job, audited. */
export async function insertBuildRequest(
  db: Db,
  input: { jobId: number; text: string },
  actorId: number | null,
  now = new Date(),
): Promise<BuildRequest> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, input.jobId);
    const at = now.toISOString();
    const { id } = await trx
      .insertInto("build_requests")
      .values({
        job_id: input.jobId,
        text: input.text,
        state: "open",
        created_by: actorId,
        created_at: at,
        updated_by: actorId,
        updated_at: at,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const saved = toRequest(
      await selectRequests(trx).where("build_requests.id", "=", id).executeTakeFirstOrThrow(),
    );
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "build_request",
      entityId: `${input.jobId}:${id}`,
      after: { text: saved.text, state: saved.state },
    });
    return saved;
  });
}

/**
 * Marks a request done, explained (with the note why not) or open again, only if the stored
 * version is the one the caller read (UPDATE … WHERE version = ?; no row changed → 409).
 */
export async function updateBuildRequestState(
  db: Db,
  input: {
    jobId: number;
    id: number;
    baseVersion: number;
    state: BuildRequestState;
    note: string | null;
  },
  actorId: number | null,
  now = new Date(),
): Promise<BuildRequest> {
  return db.transaction().execute(async (trx) => {
    await lockJob(trx, input.jobId);
    const before = await trx
      .selectFrom("build_requests")
      .selectAll()
      .where("id", "=", input.id)
      .where("job_id", "=", input.jobId)
      .executeTakeFirst();
    if (!before) throw new NotFoundError("request");
    const result = await trx
      .updateTable("build_requests")
      .set({
        state: input.state,
        note: input.note,
        version: input.baseVersion + 1,
        updated_by: actorId,
        updated_at: now.toISOString(),
      })
      .where("id", "=", input.id)
      .where("version", "=", input.baseVersion)
      .executeTakeFirst();
    if (Number(result.numUpdatedRows) !== 1) throw new StaleWriteError("request", before.version);
    const saved = toRequest(
      await selectRequests(trx).where("build_requests.id", "=", input.id).executeTakeFirstOrThrow(),
    );
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "build_request",
      entityId: `${input.jobId}:${input.id}`,
      before: { text: before.text, state: before.state, note: before.note },
      after: { text: saved.text, state: saved.state, note: saved.note },
    });
    return saved;
  });
}
