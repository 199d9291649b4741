import type { Kysely } from "kysely";
import { createAuditEntry } from "./audit";
import { NotFoundError } from "./errors";
import type { Database } from "./schema";
import type { UploadCategory, UploadContentType, UploadRow } from "./uploads-schema";

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

function selectUploads(db: Kysely<Database>) {
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

export async function createUpload(
  db: Kysely<Database>,
  input: NewUpload,
  actorId: number | null,
): Promise<StoredUpload> {
  return db.transaction().execute(async (trx) => {
    const job = await trx
      .selectFrom("jobs")
      .select("id")
      .where("id", "=", input.jobId)
      .executeTakeFirst();
    if (!job) throw new NotFoundError("job");
    const { id } = await trx
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
        uploaded_by: actorId,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const upload = toStoredUpload(
      await selectUploads(trx).where("uploads.id", "=", id).executeTakeFirstOrThrow(),
    );
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "upload",
      entityId: id,
      after: toPublicUpload(upload),
    });
    return upload;
  });
}

export async function findUploadById(
  db: Kysely<Database>,
  id: number,
): Promise<StoredUpload | undefined> {
  const row = await selectUploads(db).where("uploads.id", "=", id).executeTakeFirst();
  return row && toStoredUpload(row);
}

/** A job's files, oldest first (the order they were brought in and printed). */
export async function listUploadsForJob(db: Kysely<Database>, jobId: number): Promise<Upload[]> {
  const rows = await selectUploads(db)
    .where("uploads.job_id", "=", jobId)
    .orderBy("uploads.id")
    .execute();
  return rows.map((r) => toPublicUpload(toStoredUpload(r)));
}

/** Removes the row (with an audit entry) and returns it, so the caller can remove the files. */
export async function deleteUpload(
  db: Kysely<Database>,
  id: number,
  actorId: number | null,
): Promise<StoredUpload> {
  return db.transaction().execute(async (trx) => {
    const row = await selectUploads(trx).where("uploads.id", "=", id).executeTakeFirst();
    if (!row) throw new NotFoundError("upload");
    await trx.deleteFrom("uploads").where("id", "=", id).execute();
    const upload = toStoredUpload(row);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "delete",
      entity: "upload",
      entityId: id,
      before: toPublicUpload(upload),
    });
    return upload;
  });
}
