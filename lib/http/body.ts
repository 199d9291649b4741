import { HttpError } from "./errors";

/** What a route's body may be, and how much of it is read. */
export interface BodyLimits {
  /** Largest body in bytes: a declared length over it is refused unread, reading stops past it. */
  maxBytes: number;
  /** Deepest nesting of JSON arrays and objects (a body `[[1]]` is 2 deep). */
  maxDepth: number;
}

/** A form or a calculation request is a few kilobytes; a weigh-in CSV sent as JSON, tens. */
export const DEFAULT_BODY_LIMITS: BodyLimits = { maxBytes: 1024 * 1024, maxDepth: 16 };

/** The media type without parameters, lower case: "application/json; charset=utf-8" → "application/json". */
export function mediaTypeOf(req: Request): string {
  return (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
}

/**
 * Whether the request says it carries a body (Content-Length above 0, or chunked). Over HTTP/1.1
 * a request with neither header has no body at all.
 */
export function declaresBody(req: Request): boolean {
  const length = req.headers.get("content-length");
  if (length !== null) return Number(length) !== 0;
  return req.headers.has("transfer-encoding");
}

export function tooLargeBody(maxBytes: number): HttpError {
  return new HttpError(
    413,
    "too_large",
    `The request body is larger than the ${describeBytes(maxBytes)} this address accepts.`,
  );
}

function describeBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;
  return `${Math.ceil(bytes / 1024)} kB`;
}

/** A declared length over the limit is refused before a byte is read. */
export function assertDeclaredLength(req: Request, maxBytes: number): void {
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLargeBody(maxBytes);
}

/**
 * The body as UTF-8 text, never holding more than `maxBytes`: a declared length over it is
 * refused unread, and reading stops as soon as the bytes pass it.
 *
 * @throws HttpError 413 `too_large`
 */
export async function readBodyText(req: Request, maxBytes: number): Promise<string> {
  assertDeclaredLength(req, maxBytes);
  if (!req.body) return "";
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLargeBody(maxBytes);
    }
    chunks.push(value);
  }
  // As Request.text() decodes: UTF-8, a leading byte-order mark dropped, bad bytes replaced.
  return new TextDecoder().decode(Buffer.concat(chunks));
}

/**
 * Whether JSON text nests arrays and objects deeper than `maxDepth`, found by one pass over the
 * characters (brackets inside strings do not count) before anything is parsed, so a body of a
 * million `[` is refused in the time it takes to read it rather than the time it takes to parse.
 */
export function nestsDeeperThan(text: string, maxDepth: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c /* \ */) i++;
      else if (c === 0x22 /* " */) inString = false;
    } else if (c === 0x22) {
      inString = true;
    } else if (c === 0x5b /* [ */ || c === 0x7b /* { */) {
      if (++depth > maxDepth) return true;
    } else if (c === 0x5d /* ] */ || c === 0x7d /* } */) {
      depth--;
    }
  }
  return false;
}

/**
 * Parses JSON text within the limits: too deep is refused before parsing.
 *
 * @throws HttpError 400 `too_deep` or `bad_json`
 */
export function parseJsonText(text: string, maxDepth: number): unknown {
  if (nestsDeeperThan(text, maxDepth)) {
    throw new HttpError(
      400,
      "too_deep",
      `The request body nests lists and objects more than ${maxDepth} deep.`,
    );
  }
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new HttpError(400, "bad_json", "The request body is not valid JSON.");
  }
}

/**
 * Refuses a body that is not JSON by its declared type: only `application/json` is read as
 * JSON, so a form another site submits as `text/plain` never reaches a handler.
 *
 * @throws HttpError 415 `unsupported_media_type`
 */
export function assertJsonType(req: Request): void {
  if (mediaTypeOf(req) !== "application/json") {
    throw new HttpError(
      415,
      "unsupported_media_type",
      "Send the request body as JSON with Content-Type: application/json.",
    );
  }
}
