import { readOptionalJson } from "@/lib/http/route";
import { contentDisposition } from "@/lib/uploads/file-names";
import type { CardFile } from "./list";

// An empty POST issues with the defaults; anything present is JSON read within the route's limits.
export { readOptionalJson };

/** The issue options: the JSON body, with `?pageSize=` used when the body does not name one. */
export async function readIssueRequest(req: Request): Promise<unknown> {
  const body = await readOptionalJson(req);
  const pageSize = new URL(req.url).searchParams.get("pageSize");
  if (pageSize === null || typeof body !== "object" || body === null || Array.isArray(body))
    return body;
  return "pageSize" in body ? body : { ...body, pageSize };
}

/** The card's bytes as issued, offered as a download under a safe name. */
export function cardPdfResponse(file: CardFile): Response {
  return new Response(new Uint8Array(file.bytes), {
    status: 200,
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": contentDisposition("attachment", file.fileName),
      "Content-Length": String(file.bytes.byteLength),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-cache",
      ETag: `"${file.sha256}"`,
      "Cross-Origin-Resource-Policy": "same-origin",
    },
  });
}

/** The logo's bytes for the owner's settings page. */
export function imageResponse(content: Buffer, contentType: string, sha256: string): Response {
  return new Response(new Uint8Array(content), {
    status: 200,
    headers: {
      "Content-Type": contentType,
      "Content-Length": String(content.byteLength),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-cache",
      ETag: `"${sha256}"`,
      "Content-Security-Policy": "default-src 'none'; sandbox",
    },
  });
}
