import { HttpError } from "@/lib/http/errors";
import { formatMegabytes } from "./limits";

// Room for the multipart boundaries and the category and caption fields around the file.
export const FORM_OVERHEAD_BYTES = 64 * 1024;

export function tooLarge(maxBytes: number): HttpError {
  const message = `The file is larger than the ${formatMegabytes(maxBytes)} limit.`;
  return new HttpError(413, "too_large", message, { file: message });
}

/**
 * Reads a multipart body without ever holding more than the limit: a declared length over it is
 * refused before reading, and reading stops as soon as the body passes it.
 */
export async function readUploadForm(req: Request, maxBytes: number): Promise<FormData> {
  const contentType = req.headers.get("content-type") ?? "";
  if (!contentType.toLowerCase().startsWith("multipart/form-data")) {
    throw new HttpError(422, "invalid_input", "Send the file as multipart/form-data.", {
      file: "Choose a file to attach.",
    });
  }
  const limit = maxBytes + FORM_OVERHEAD_BYTES;
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > limit) throw tooLarge(maxBytes);
  if (!req.body)
    throw new HttpError(422, "invalid_input", "Choose a file to attach.", {
      file: "Choose a file to attach.",
    });

  const chunks: Uint8Array[] = [];
  let total = 0;
  const reader = req.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(maxBytes);
    }
    chunks.push(value);
  }
  // A body shorter than it said was cut off on the way (a proxy limit in front of the app).
  if (Number.isFinite(declared) && total < declared) throw tooLarge(maxBytes);

  try {
    return await new Response(Buffer.concat(chunks), {
      headers: { "content-type": contentType },
    }).formData();
  } catch {
    throw new HttpError(422, "invalid_input", "The upload could not be read; try again.", {
      file: "The upload could not be read; try again.",
    });
  }
}
