import type { Kysely, Transaction } from "kysely";
import { createAuditEntry } from "./audit";
import type { BuildRequestState, BuildSectionName } from "./build-record-schema";
import { forUpdate, isUniqueViolation, lockJob } from "./dialect";
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

export interface StoredBuildSection {
  section: BuildSectionName;
  data: unknown;
  version: number;
  updatedBy: string | null;
  updatedAt: string;
}

/** Every saved section of a job's build record (sections never saved are not listed). */
export async function listBuildSections(db: Db, jobId: number): Promise<StoredBuildSection[]> {
  const rows = await db
    .selectFrom("build_sections")
    .leftJoin("users", "users.id", "build_sections.updated_by")
    .selectAll("build_sections")
    .select("users.name as updater_name")
    .where("build_sections.job_id", "=", jobId)
    .execute();
  return rows.map((r) => ({
    section: r.section,
    data: JSON.parse(r.data_json) as unknown,
    version: r.version,
    updatedBy: r.updater_name,
    updatedAt: r.updated_at,
  }));
}

/**
 * Saves one section of a job's build record inside the caller's transaction (the service holds
 * the job's lock), if the stored version is the one the caller read (0: never saved). An update
 * is `UPDATE … WHERE version = ?` with the row count checked. Audited with before and after.
 *
 * @throws StaleWriteError (409) with the stored version
 */
export async function saveBuildSection(
  trx: Transaction<Database>,
  write: { jobId: number; section: BuildSectionName; data: unknown; baseVersion: number },
  actorId: number | null,
  now = new Date(),
): Promise<{ version: number; updatedAt: string }> {
  const before = await trx
    .selectFrom("build_sections")
    .selectAll()
    .where("job_id", "=", write.jobId)
    .where("section", "=", write.section)
    .executeTakeFirst();
  const current = before?.version ?? 0;
  if (current !== write.baseVersion) throw new StaleWriteError("build record section", current);
  const at = now.toISOString();
  const data_json = JSON.stringify(write.data);
  const version = write.baseVersion + 1;
  if (before) {
    const result = await trx
      .updateTable("build_sections")
      .set({ data_json, version, updated_by: actorId, updated_at: at })
      .where("job_id", "=", write.jobId)
      .where("section", "=", write.section)
      .where("version", "=", write.baseVersion)
      .executeTakeFirst();
    if (Number(result.numUpdatedRows) !== 1) {
      throw new StaleWriteError("build record section", current);
    }
  } else {
    await trx
      .insertInto("build_sections")
      .values({
        job_id: write.jobId,
        section: write.section,
        data_json,
        version,
        updated_by: actorId,
        updated_at: at,
      })
      .execute();
  }
  await createAuditEntry(trx, {
    userId: actorId,
    action: "record",
    entity: "build_section",
    entityId: `${write.jobId}:${write.section}`,
    before: before ? (JSON.parse(before.data_json) as unknown) : null,
    after: write.data,
  });
  return { version, updatedAt: at };
}

export interface StoredBuildSettings {
  data: unknown;
  version: number;
  updatedAt: string | null;
}

/** The shop's build settings as stored (version 0 and no data: never saved). */
export async function findBuildSettings(db: Db): Promise<StoredBuildSettings> {
  const row = await db
    .selectFrom("build_settings")
    .selectAll()
    .where("id", "=", 1)
    .executeTakeFirst();
  return row
    ? {
        data: JSON.parse(row.data_json) as unknown,
        version: row.version,
        updatedAt: row.updated_at,
      }
    : { data: null, version: 0, updatedAt: null };
}

/**
 * Saves the shop's build settings if the stored version is the one read (0: never saved);
 * `UPDATE … WHERE version = ?` with the row count checked. Audited.
 *
 * @throws StaleWriteError (409) with the stored version
 */
export async function saveBuildSettings(
  db: Db,
  write: { data: unknown; baseVersion: number },
  actorId: number | null,
  now = new Date(),
): Promise<{ version: number; updatedAt: string }> {
  return db.transaction().execute(async (trx) => {
    const before = await trx
      .selectFrom("build_settings")
      .selectAll()
      .where("id", "=", 1)
      .$call(forUpdate(trx))
      .executeTakeFirst();
    const current = before?.version ?? 0;
    if (current !== write.baseVersion) throw new StaleWriteError("build settings", current);
    const at = now.toISOString();
    const data_json = JSON.stringify(write.data);
    const version = current + 1;
    if (before) {
      const result = await trx
        .updateTable("build_settings")
        .set({ data_json, version, updated_by: actorId, updated_at: at })
        .where("id", "=", 1)
        .where("version", "=", write.baseVersion)
        .executeTakeFirst();
      if (Number(result.numUpdatedRows) !== 1) throw new StaleWriteError("build settings", current);
    } else {
      try {
        await trx
          .insertInto("build_settings")
          .values({ id: 1, data_json, version, updated_by: actorId, updated_at: at })
          .execute();
      } catch (error) {
        // Another first save got there: this one was based on nothing.
        if (isUniqueViolation(error)) throw new StaleWriteError("build settings", 1);
        throw error;
      }
    }
    await createAuditEntry(trx, {
      userId: actorId,
      action: "update",
      entity: "build_settings",
      entityId: 1,
      before: before ? (JSON.parse(before.data_json) as unknown) : null,
      after: write.data,
    });
    return { version, updatedAt: at };
  });
}

export interface BuildCardSummary {
  revision: number;
  sha256: string;
  verificationCode: string;
  issuedAt: string;
  issuedBy: string | null;
  sizeBytes: number;
}

/** The next revision number of a job's build record PDF (1 for the first). */
export async function findNextBuildCardRevision(db: Db, jobId: number): Promise<number> {
  const row = await db
    .selectFrom("build_cards")
    .select((eb) => eb.fn.max("revision").as("last"))
    .where("job_id", "=", jobId)
    .executeTakeFirst();
  return Number(row?.last ?? 0) + 1;
}

/**
 * Stores an issued build record PDF. Two issued at the same moment cannot both take a revision:
 * the second is refused as stale (409).
 */
export async function insertBuildCard(
  db: Db,
  card: {
    jobId: number;
    revision: number;
    pdf: Buffer;
    sha256: string;
    dataJson: string;
    verificationCode: string;
    issuedAt: string;
  },
  actorId: number | null,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await lockJob(trx, card.jobId);
    try {
      await trx
        .insertInto("build_cards")
        .values({
          job_id: card.jobId,
          revision: card.revision,
          pdf: card.pdf,
          sha256: card.sha256,
          data_json: card.dataJson,
          verification_code: card.verificationCode,
          issued_at: card.issuedAt,
          issued_by: actorId,
        })
        .execute();
    } catch (error) {
      if (isUniqueViolation(error)) throw new StaleWriteError("build record PDF", card.revision);
      throw error;
    }
    await createAuditEntry(trx, {
      userId: actorId,
      action: "issue",
      entity: "build_card",
      entityId: `${card.jobId}:${card.revision}`,
      after: { revision: card.revision, sha256: card.sha256 },
    });
  });
}

/** A job's issued build record PDFs, newest first, without the bytes. */
export async function listBuildCards(db: Db, jobId: number): Promise<BuildCardSummary[]> {
  const rows = await db
    .selectFrom("build_cards")
    .leftJoin("users", "users.id", "build_cards.issued_by")
    .select([
      "build_cards.revision",
      "build_cards.sha256",
      "build_cards.verification_code",
      "build_cards.issued_at",
      "users.name as issuer",
      (eb) => eb.fn("length", ["build_cards.pdf"]).as("size"),
    ])
    .where("build_cards.job_id", "=", jobId)
    .orderBy("build_cards.revision", "desc")
    .execute();
  return rows.map((r) => ({
    revision: r.revision,
    sha256: r.sha256,
    verificationCode: r.verification_code,
    issuedAt: r.issued_at,
    issuedBy: r.issuer,
    sizeBytes: Number(r.size),
  }));
}

/** The bytes of one issued revision, or undefined. */
export async function findBuildCardPdf(
  db: Db,
  jobId: number,
  revision: number,
): Promise<Buffer | undefined> {
  const row = await db
    .selectFrom("build_cards")
    .select("pdf")
    .where("job_id", "=", jobId)
    .where("revision", "=", revision)
    .executeTakeFirst();
  return row ? Buffer.from(row.pdf) : undefined;
}

export interface StoredBuildCard {
  jobId: number;
  revision: number;
  /** The latest revision of the same job: this one is current when they are equal. */
  latestRevision: number;
  sha256: string;
  dataJson: string;
  verificationCode: string;
  issuedAt: string;
}

/** An issued build record by its verification code (stored form), with the job's latest revision. */
export async function findBuildCardByCode(
  db: Db,
  code: string,
): Promise<StoredBuildCard | undefined> {
  const row = await db
    .selectFrom("build_cards")
    .select(["job_id", "revision", "sha256", "data_json", "verification_code", "issued_at"])
    .where("verification_code", "=", code)
    .executeTakeFirst();
  if (!row) return undefined;
  const latest = await findNextBuildCardRevision(db, row.job_id);
  return {
    jobId: row.job_id,
    revision: row.revision,
    latestRevision: latest - 1,
    sha256: row.sha256,
    dataJson: row.data_json,
    verificationCode: row.verification_code,
    issuedAt: row.issued_at,
  };
}
