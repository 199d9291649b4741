import type { StoredUpload } from "@/db/uploads";
import { HttpError } from "@/lib/http/errors";
import { contentDisposition, downloadName } from "./file-names";
import { readStoredFile } from "./storage";

const EXTENSION = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "application/pdf": "pdf",
} as const;

// Images are shown as images only: no scripts, no plugins, even if a browser were to look inside.
const IMAGE_CSP = "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox";

/**
 * The stored bytes with headers that make a browser treat them as exactly the detected type:
 * nosniff, inline (or attachment) with a safe name, private caching revalidated by ETag.
 */
export async function uploadFileResponse(
  upload: StoredUpload,
  options: { variant: "original" | "thumbnail"; download?: boolean; ifNoneMatch?: string | null },
): Promise<Response> {
  const thumbnail = options.variant === "thumbnail";
  const name = thumbnail ? upload.thumbnailName : upload.storedName;
  if (!name) throw new HttpError(404, "not_found", "This file has no thumbnail.");
  const contentType = thumbnail ? "image/webp" : upload.contentType;
  const etag = `"${upload.sha256.slice(0, 32)}${thumbnail ? "-t" : ""}"`;
  const headers = new Headers({
    "Content-Type": contentType,
    "X-Content-Type-Options": "nosniff",
    "Cache-Control": "private, no-cache",
    ETag: etag,
    "Cross-Origin-Resource-Policy": "same-origin",
    "Referrer-Policy": "no-referrer",
  });
  if (contentType !== "application/pdf") headers.set("Content-Security-Policy", IMAGE_CSP);
  const extension = thumbnail ? "webp" : EXTENSION[upload.contentType];
  headers.set(
    "Content-Disposition",
    contentDisposition(
      options.download ? "attachment" : "inline",
      downloadName(thumbnail ? `thumbnail-${upload.originalName}` : upload.originalName, extension),
    ),
  );
  if (options.ifNoneMatch?.split(/\s*,\s*/).includes(etag)) {
    return new Response(null, { status: 304, headers });
  }
  const bytes = await readStoredFile(name);
  if (!bytes) throw new HttpError(404, "not_found", "The file is missing from storage.");
  headers.set("Content-Length", String(bytes.byteLength));
  return new Response(new Uint8Array(bytes), { status: 200, headers });
}
