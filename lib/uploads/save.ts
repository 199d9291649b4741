import { createHash } from "node:crypto";
import type { DB } from "@/db/client";
import { createUpload, deleteUpload, listUploadsForJob, type StoredUpload } from "@/db/uploads";
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
 */
export async function saveJobUpload(
  db: DB,
  jobId: number,
  input: UploadFormInput,
  actor: User,
  limits: { maxBytes: number },
): Promise<UploadView> {
  await findJobForUser(db, jobId, actor);
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
