import type { Kysely, Transaction } from "kysely";
import type { Database } from "./schema";
import type { UploadCategory, UploadContentType, UploadRow } from "./uploads-schema";

// Files attached to jobs: the queries only. Keeping and removing one (the audit entry, the one
// transaction, the files on disk) is lib/uploads/save.ts.

type Db = Kysely<Database> | Transaction<Database>;

/** A file attached to a job, as the app and the API show it (never the names on disk). */
export interface Upload {
  id: number;
  jobId: number;
  category: UploadCategory;
  caption: string | null;
  originalName: string;
  contentType: UploadContentType;
  sizeBytes: number;
  sha256: string;
  width: number | null;
  height: number | null;
  hasThumbnail: boolean;
  uploadedBy: number | null;
  uploadedByName: string | null;
  createdAt: string;
}

/** The same with where its bytes are kept: for lib/uploads only. */
export interface StoredUpload extends Upload {
  storedName: string;
  thumbnailName: string | null;
}

type RowWithUploader = UploadRow & { uploader_name: string | null };

function toStoredUpload(row: RowWithUploader): StoredUpload {
  return {
    id: row.id,
    jobId: row.job_id,
    category: row.category,
    caption: row.caption,
    originalName: row.original_name,
    contentType: row.content_type,
    sizeBytes: row.size_bytes,
    sha256: row.sha256,
    width: row.width,
    height: row.height,
    hasThumbnail: row.thumbnail_name !== null,
    uploadedBy: row.uploaded_by,
    uploadedByName: row.uploader_name,
    createdAt: row.created_at,
    storedName: row.stored_name,
    thumbnailName: row.thumbnail_name,
  };
}

export function toPublicUpload(stored: StoredUpload): Upload {
  const { storedName: _s, thumbnailName: _t, ...upload } = stored;
  return upload;
}

function selectUploads(db: Db) {
  return db
    .selectFrom("uploads")
    .leftJoin("users", "users.id", "uploads.uploaded_by")
    .selectAll("uploads")
    .select("users.name as uploader_name");
}

export interface NewUpload {
  jobId: number;
  category: UploadCategory;
  caption: string | null;
  originalName: string;
  contentType: UploadContentType;
  sizeBytes: number;
  sha256: string;
  storedName: string;
  thumbnailName: string | null;
  width: number | null;
  height: number | null;
}

/** Stores a file's row (its bytes are already on disk) and answers it with its uploader. */
export async function insertUpload(
  db: Db,
  input: NewUpload,
  uploadedBy: number | null,
): Promise<StoredUpload> {
  const { id } = await db
    .insertInto("uploads")
    .values({
      job_id: input.jobId,
      category: input.category,
      caption: input.caption,
      original_name: input.originalName,
      content_type: input.contentType,
      size_bytes: input.sizeBytes,
      sha256: input.sha256,
      stored_name: input.storedName,
      thumbnail_name: input.thumbnailName,
      width: input.width,
      height: input.height,
      uploaded_by: uploadedBy,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return toStoredUpload(
    await selectUploads(db).where("uploads.id", "=", id).executeTakeFirstOrThrow(),
  );
}

export async function findUploadById(db: Db, id: number): Promise<StoredUpload | undefined> {
  const row = await selectUploads(db).where("uploads.id", "=", id).executeTakeFirst();
  return row && toStoredUpload(row);
}

/** A job's files, oldest first (the order they were brought in and printed). */
export async function listUploadsForJob(db: Db, jobId: number): Promise<Upload[]> {
  const rows = await selectUploads(db)
    .where("uploads.job_id", "=", jobId)
    .orderBy("uploads.id")
    .execute();
  return rows.map((r) => toPublicUpload(toStoredUpload(r)));
}

/** Removes a file's row (its bytes stay on disk for the caller to remove). */
export async function deleteUploadRow(db: Db, id: number): Promise<void> {
  await db.deleteFrom("uploads").where("id", "=", id).execute();
}
