import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import type { UploadContentType } from "@/db/uploads-schema";
import { HttpError } from "@/lib/http/errors";

export type StoredExtension = "jpg" | "png" | "webp" | "pdf";

export interface InspectedFile {
  contentType: UploadContentType;
  extension: StoredExtension;
  /** Pixel size for images, as they stand upright; null for PDFs. */
  image: { width: number; height: number } | null;
}

// Detected from the bytes only; the name and the browser's claimed type are ignored.
const ACCEPTED: Record<string, { contentType: UploadContentType; extension: StoredExtension }> = {
  "image/jpeg": { contentType: "image/jpeg", extension: "jpg" },
  "image/png": { contentType: "image/png", extension: "png" },
  "image/webp": { contentType: "image/webp", extension: "webp" },
  "application/pdf": { contentType: "application/pdf", extension: "pdf" },
};
const SHARP_FORMAT: Record<string, string> = { jpg: "jpeg", png: "png", webp: "webp" };

// A decompression bomb is refused before it is expanded: 100 megapixels covers any camera.
const MAX_PIXELS = 100_000_000;
const EXECUTABLES = new Set([
  "elf",
  "exe",
  "mach",
  "dmg",
  "msi",
  "deb",
  "rpm",
  "apk",
  "class",
  "wasm",
]);

export const ACCEPTED_KINDS_TEXT = "photos (JPEG, PNG or WebP) and PDF files";

function refuse(message: string): never {
  throw new HttpError(422, "unsupported_type", message, { file: message });
}

function looksLikeSvg(bytes: Uint8Array): boolean {
  const head = Buffer.from(bytes.subarray(0, 4096)).toString("utf8").toLowerCase();
  return head.includes("<svg");
}

/** What the file really is, or a 422 saying why it cannot be kept. */
export async function inspectUpload(bytes: Uint8Array): Promise<InspectedFile> {
  const detected = await fileTypeFromBuffer(bytes);
  const accepted = detected && ACCEPTED[detected.mime];
  if (!accepted) {
    if (looksLikeSvg(bytes)) {
      refuse("SVG drawings cannot be attached (they can carry scripts): save it as PNG or PDF.");
    }
    if (detected && EXECUTABLES.has(detected.ext)) {
      refuse(`This file is a program (${detected.ext.toUpperCase()}), not a photo or a PDF.`);
    }
    refuse(
      detected
        ? `This file is ${detected.ext.toUpperCase()}; only ${ACCEPTED_KINDS_TEXT} can be attached.`
        : `Only ${ACCEPTED_KINDS_TEXT} can be attached; this file is neither.`,
    );
  }
  if (accepted.extension === "pdf") return { ...accepted, image: null };
  try {
    const meta = await sharp(bytes, { limitInputPixels: MAX_PIXELS }).metadata();
    if (meta.format !== SHARP_FORMAT[accepted.extension] || !meta.width || !meta.height) {
      throw new Error("format mismatch");
    }
    const upright = meta.autoOrient ?? meta;
    return { ...accepted, image: { width: upright.width, height: upright.height } };
  } catch {
    return refuse("This image could not be read: it may be damaged or too large in pixels.");
  }
}

/** A 320 px wide WebP preview, turned upright by its EXIF orientation. */
export async function makeThumbnail(bytes: Uint8Array): Promise<Buffer> {
  return sharp(bytes, { limitInputPixels: MAX_PIXELS })
    .rotate()
    .resize({ width: 320, withoutEnlargement: true })
    .webp({ quality: 78 })
    .toBuffer();
}
