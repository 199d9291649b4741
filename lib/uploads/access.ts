import type { DB } from "@/db/client";
import { findUploadById, type StoredUpload, toPublicUpload, type Upload } from "@/db/uploads";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { findJobForUser } from "@/lib/jobs/access";

/** An upload with the addresses it is read from. */
export interface UploadView extends Upload {
  url: string;
  thumbnailUrl: string | null;
}

/** Never carries the names on disk, even when given a stored upload. */
export function toUploadView(upload: Upload | StoredUpload): UploadView {
  return {
    ...("storedName" in upload ? toPublicUpload(upload) : upload),
    url: `/api/uploads/${upload.id}`,
    thumbnailUrl: upload.hasThumbnail ? `/api/uploads/${upload.id}/thumbnail` : null,
  };
}

/** The upload if this user may see its job; otherwise the same 404 as for one that does not exist. */
export async function findUploadForUser(db: DB, id: number, user: User): Promise<StoredUpload> {
  const upload = await findUploadById(db, id);
  if (!upload) throw new HttpError(404, "not_found", "No such file.");
  await findJobForUser(db, upload.jobId, user).catch((error: unknown) => {
    if (error instanceof HttpError && error.status === 404) {
      throw new HttpError(404, "not_found", "No such file.");
    }
    throw error;
  });
  return upload;
}
