import type { Kysely, Transaction } from "kysely";
import type { BuildRequestState, BuildSectionName } from "./build-record-schema";
import { forUpdate, isUniqueViolation } from "./dialect";
import type { Database } from "./schema";

// All SQL of the engine build record: the customer's requests for the build, the record's
// sections, the shop's build settings and the issued PDFs. Each function runs in the database
// or transaction it is given; the transactions, locks, version rules and audit entries are
// lib/build-record's.

type Db = Kysely<Database> | Transaction<Database>;

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

/** One of a job's requests, or undefined. */
export async function findBuildRequest(
  db: Db,
  jobId: number,
  id: number,
): Promise<BuildRequest | undefined> {
  const row = await selectRequests(db)
    .where("build_requests.id", "=", id)
    .where("build_requests.job_id", "=", jobId)
    .executeTakeFirst();
  return row ? toRequest(row) : undefined;
}

/** Stores a new request for a job; answers its id. */
export async function insertBuildRequest(
  db: Db,
  input: { jobId: number; text: string; state: BuildRequestState },
  actorId: number | null,
  at: string,
): Promise<number> {
  const { id } = await db
    .insertInto("build_requests")
    .values({
      job_id: input.jobId,
      text: input.text,
      state: input.state,
      created_by: actorId,
      created_at: at,
      updated_by: actorId,
      updated_at: at,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return id;
}

/**
 * Writes a request's state and note as the next version, only where the stored version is
 * `baseVersion` (UPDATE … WHERE version = ?). Answers whether a row was changed.
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
  at: string,
): Promise<boolean> {
  const result = await db
    .updateTable("build_requests")
    .set({
      state: input.state,
      note: input.note,
      version: input.baseVersion + 1,
      updated_by: actorId,
      updated_at: at,
    })
    .where("id", "=", input.id)
    .where("job_id", "=", input.jobId)
    .where("version", "=", input.baseVersion)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
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

/** One stored section of a job's build record (raw JSON and version), or undefined. */
export async function findBuildSection(
  db: Db,
  jobId: number,
  section: BuildSectionName,
): Promise<{ data: unknown; version: number } | undefined> {
  const row = await db
    .selectFrom("build_sections")
    .select(["data_json", "version"])
    .where("job_id", "=", jobId)
    .where("section", "=", section)
    .executeTakeFirst();
  return row ? { data: JSON.parse(row.data_json) as unknown, version: row.version } : undefined;
}

/** Stores a section never saved before, at the version given. */
export async function insertBuildSection(
  db: Db,
  write: { jobId: number; section: BuildSectionName; data: unknown; version: number },
  actorId: number | null,
  at: string,
): Promise<void> {
  await db
    .insertInto("build_sections")
    .values({
      job_id: write.jobId,
      section: write.section,
      data_json: JSON.stringify(write.data),
      version: write.version,
      updated_by: actorId,
      updated_at: at,
    })
    .execute();
}

/**
 * Writes a section as `baseVersion + 1`, only where the stored version is `baseVersion`
 * (UPDATE … WHERE version = ?). Answers whether a row was changed.
 */
export async function updateBuildSection(
  db: Db,
  write: { jobId: number; section: BuildSectionName; data: unknown; baseVersion: number },
  actorId: number | null,
  at: string,
): Promise<boolean> {
  const result = await db
    .updateTable("build_sections")
    .set({
      data_json: JSON.stringify(write.data),
      version: write.baseVersion + 1,
      updated_by: actorId,
      updated_at: at,
    })
    .where("job_id", "=", write.jobId)
    .where("section", "=", write.section)
    .where("version", "=", write.baseVersion)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

export interface StoredBuildSettings {
  data: unknown;
  version: number;
  updatedAt: string | null;
}

/**
 * The shop's build settings as stored (version 0 and no data: never saved). With `lock`, the
 * row is held until the transaction ends (PostgreSQL; see forUpdate).
 */
export async function findBuildSettings(
  db: Db,
  options: { lock?: boolean } = {},
): Promise<StoredBuildSettings> {
  const row = await db
    .selectFrom("build_settings")
    .selectAll()
    .where("id", "=", 1)
    .$if(options.lock === true, (qb) => qb.$call(forUpdate(db)))
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
 * Stores the shop's first build settings (row 1). Answers false when a row 1 is already there
 * (another first save got in first).
 */
export async function insertBuildSettings(
  db: Db,
  write: { data: unknown; version: number },
  actorId: number | null,
  at: string,
): Promise<boolean> {
  try {
    await db
      .insertInto("build_settings")
      .values({
        id: 1,
        data_json: JSON.stringify(write.data),
        version: write.version,
        updated_by: actorId,
        updated_at: at,
      })
      .execute();
    return true;
  } catch (error) {
    if (isUniqueViolation(error)) return false;
    throw error;
  }
}

/**
 * Writes the shop's build settings as `baseVersion + 1`, only where the stored version is
 * `baseVersion` (UPDATE … WHERE version = ?). Answers whether the row was changed.
 */
export async function updateBuildSettings(
  db: Db,
  write: { data: unknown; baseVersion: number },
  actorId: number | null,
  at: string,
): Promise<boolean> {
  const result = await db
    .updateTable("build_settings")
    .set({
      data_json: JSON.stringify(write.data),
      version: write.baseVersion + 1,
      updated_by: actorId,
      updated_at: at,
    })
    .where("id", "=", 1)
    .where("version", "=", write.baseVersion)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

export interface BuildCardSummary {
  revision: number;
  sha256: string;
  verificationCode: string;
  issuedAt: string;
  issuedBy: string | null;
  sizeBytes: number;
}

/** The highest revision issued for a job (0 when none has been). */
export async function findLatestBuildCardRevision(db: Db, jobId: number): Promise<number> {
  const row = await db
    .selectFrom("build_cards")
    .select((eb) => eb.fn.max("revision").as("last"))
    .where("job_id", "=", jobId)
    .executeTakeFirst();
  return Number(row?.last ?? 0);
}

/**
 * Stores an issued build record PDF. Answers false when the job already has that revision
 * (another issue took it first); on PostgreSQL the transaction is then spoilt and must end.
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
): Promise<boolean> {
  try {
    await db
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
    return true;
  } catch (error) {
    if (isUniqueViolation(error)) return false;
    throw error;
  }
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

function selectStoredBuildCards(db: Db) {
  return db
    .selectFrom("build_cards")
    .select(["job_id", "revision", "sha256", "data_json", "verification_code", "issued_at"]);
}

type StoredBuildCardRow = Awaited<
  ReturnType<ReturnType<typeof selectStoredBuildCards>["executeTakeFirstOrThrow"]>
>;

async function toStoredBuildCard(db: Db, row: StoredBuildCardRow): Promise<StoredBuildCard> {
  return {
    jobId: row.job_id,
    revision: row.revision,
    latestRevision: await findLatestBuildCardRevision(db, row.job_id),
    sha256: row.sha256,
    dataJson: row.data_json,
    verificationCode: row.verification_code,
    issuedAt: row.issued_at,
  };
}

/** An issued build record by its verification code (stored form), with the job's latest revision. */
export async function findBuildCardByCode(
  db: Db,
  code: string,
): Promise<StoredBuildCard | undefined> {
  const row = await selectStoredBuildCards(db)
    .where("verification_code", "=", code)
    .executeTakeFirst();
  return row && toStoredBuildCard(db, row);
}

/** The issued build record whose PDF has this SHA-256 (hex), or undefined. */
export async function findBuildCardByHash(
  db: Db,
  sha256: string,
): Promise<StoredBuildCard | undefined> {
  const row = await selectStoredBuildCards(db).where("sha256", "=", sha256).executeTakeFirst();
  return row && toStoredBuildCard(db, row);
}

/** Of the codes given (stored form), the first that belongs to an issued build record. */
export async function findBuildCardByAnyCode(
  db: Db,
  codes: string[],
): Promise<StoredBuildCard | undefined> {
  if (codes.length === 0) return undefined;
  const rows = await selectStoredBuildCards(db).where("verification_code", "in", codes).execute();
  const byCode = new Map(rows.map((r) => [r.verification_code, r]));
  const first = codes.map((c) => byCode.get(c)).find((r) => r !== undefined);
  return first && toStoredBuildCard(db, first);
}
