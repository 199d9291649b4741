import { createHash } from "node:crypto";
import { createAuditEntry } from "@/db/audit";
import type { DB } from "@/db/client";
import { NotFoundError } from "@/db/errors";
import { jobExists } from "@/db/jobs";
import {
  deleteUploadRow,
  findUploadById,
  insertUpload,
  listUploadsForJob,
  type NewUpload,
  type StoredUpload,
  toPublicUpload,
} from "@/db/uploads";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";
import type { UploadFormInput } from "@/lib/validation/uploads";
import { findUploadForUser, toUploadView, type UploadView } from "./access";
import { newStoredName, sanitiseDisplayName } from "./file-names";
import { inspectUpload, makeThumbnail } from "./inspect";
import { tooLarge } from "./read-form";
import { removeStoredFiles, writeStoredFile } from "./storage";

/**
 * Keeps a file for a job: its kind is read from the bytes (JPEG, PNG, WebP or PDF only), it is
 * stored under a random name of ours in UPLOADS_DIR, images get a thumbnail, and the row and its
 * audit entry are written together. The uploader's file name is kept for display only.
 * The caller has already checked that `actor` may see the job (`findJobForUser`): the upload
 * route does it before reading the body, so a refused upload is not read at all.
 */
export async function saveJobUpload(
  db: DB,
  jobId: number,
  input: UploadFormInput,
  actor: User,
  limits: { maxBytes: number },
): Promise<UploadView> {
  const { file } = input;
  if (file.size === 0) {
    throw new HttpError(422, "invalid_input", "The file is empty.", { file: "The file is empty." });
  }
  if (file.size > limits.maxBytes) throw tooLarge(limits.maxBytes);
  const bytes = new Uint8Array(await file.arrayBuffer());
  const kind = await inspectUpload(bytes);
  const thumbnail = kind.image ? await makeThumbnail(bytes) : null;

  const names = newStoredName(kind.extension);
  const written: string[] = [];
  try {
    await writeStoredFile(names.stored, bytes);
    written.push(names.stored);
    if (thumbnail) {
      await writeStoredFile(names.thumbnail, thumbnail);
      written.push(names.thumbnail);
    }
    const upload = await createUpload(
      db,
      {
        jobId,
        category: input.category,
        caption: input.caption,
        originalName: sanitiseDisplayName(file.name, kind.extension),
        contentType: kind.contentType,
        sizeBytes: bytes.byteLength,
        sha256: createHash("sha256").update(bytes).digest("hex"),
        storedName: names.stored,
        thumbnailName: thumbnail ? names.thumbnail : null,
        width: kind.image?.width ?? null,
        height: kind.image?.height ?? null,
      },
      actor.id,
    );
    return toUploadView(upload);
  } catch (error) {
    await removeStoredFiles(written).catch(() => undefined);
    throw error;
  }
}

/** A job's files for someone who may see the job. */
export async function listJobUploads(db: DB, jobId: number, user: User): Promise<UploadView[]> {
  await findJobForUser(db, jobId, user);
  return (await listUploadsForJob(db, jobId)).map(toUploadView);
}

/** Removes the row (audited) and then its files; a file already gone is not an error. */
export async function removeJobUpload(db: DB, id: number, actor: User): Promise<UploadView> {
  await findUploadForUser(db, id, actor);
  const removed: StoredUpload = await deleteUpload(db, id, actor.id);
  await removeStoredFiles([removed.storedName, removed.thumbnailName]).catch((error: unknown) =>
    console.error("could not remove stored files of upload", id, error),
  );
  return toUploadView(removed);
}

/**
 * Stores a file's row (its bytes already written) with its audit entry, in one transaction.
 *
 * @example await createUpload(db, { jobId, category: "arrival-photo", caption: null, originalName: "crank.jpg", … }, userId)
 * @throws NotFoundError when there is no such job
 */
async function createUpload(
  db: DB,
  input: NewUpload,
  actorId: number | null,
): Promise<StoredUpload> {
  return db.transaction().execute(async (trx) => {
    if (!(await jobExists(trx, input.jobId))) throw new NotFoundError("job");
    const upload = await insertUpload(trx, input, actorId);
    await createAuditEntry(trx, {
      userId: actorId,
      action: "create",
      entity: "upload",
      entityId: upload.id,
      after: toPublicUpload(upload),
    });
    return upload;
  });
}

/**
 * Removes a file's row with its audit entry and answers it, so the caller can remove the files.
 *
 * @example const removed = await deleteUpload(db, uploadId, userId)
 * @throws NotFoundError when there is no such file
 */
export async function deleteUpload(
  db: DB,
  id: number,
  actorId: number | null,
): Promise<StoredUpload> {
  return db.transaction().execute(async (trx) => {
    const upload = await findUploadById(trx, id);
    if (!upload) throw new NotFoundError("upload");
    await deleteUploadRow(trx, id);
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
