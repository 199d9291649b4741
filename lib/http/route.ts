import { NextResponse } from "next/server";
import type { z } from "zod";
import {
  assertDeclaredLength,
  assertJsonType,
  type BodyLimits,
  DEFAULT_BODY_LIMITS,
  declaresBody,
  mediaTypeOf,
  parseJsonText,
  readBodyText,
} from "./body";
import { HttpError } from "./errors";
import { assertSameOrigin } from "./origin";
import { withPrivateHeaders } from "./response-headers";
import { toErrorBody } from "./to-error-body";

type Context<P> = { params: Promise<P> };
type Handler<P> = (req: Request, ctx: Context<P>) => Promise<Response>;

/**
 * What a route accepts at the edge. The defaults fit a JSON API called from the app's own pages;
 * a route that takes anything else says so here, beside its handler.
 */
export interface RouteOptions {
  /**
   * The body's media type: `json` (the default; also what a route that reads no body gets),
   * `multipart` (a file upload: `multipart/form-data`), or `any` (a raw payload checked by other
   * means, such as a signature).
   */
  accepts?: "json" | "multipart" | "any";
  /** Largest body in bytes (default 1 MiB); a function for a limit read from the settings. */
  maxBytes?: number | (() => number);
  /** Deepest JSON nesting (default 16). */
  maxDepth?: number;
  /**
   * `same-origin` (the default): a state-changing request from a browser page must come from the
   * app's own origin. `any`: a server-to-server call with no Origin of ours (a signed webhook).
   */
  origin?: "same-origin" | "any";
}

const limitsByRequest = new WeakMap<Request, BodyLimits>();

const UNSUPPORTED: Record<"json" | "multipart", string> = {
  json: "Send the request body as JSON with Content-Type: application/json.",
  multipart: "Send the file as multipart/form-data.",
};

/**
 * Wraps a route handler: the request guard at the API edge, then the handler, then the one error
 * shape with the right status for every failure, and private caching headers on every answer.
 *
 * The guard, before the handler runs: a state-changing request from another site is 403
 * (`assertSameOrigin`); a declared body of the wrong media type is 415; a declared length over
 * the route's limit is 413. `parseJson` then reads at most that many bytes and refuses nesting
 * deeper than the limit before parsing (400).
 */
export function route<P = Record<string, string>>(handler: Handler<P>): Handler<P>;
export function route<P = Record<string, string>>(
  options: RouteOptions,
  handler: Handler<P>,
): Handler<P>;
export function route<P = Record<string, string>>(
  first: Handler<P> | RouteOptions,
  second?: Handler<P>,
): Handler<P> {
  const [options, handler] =
    typeof first === "function" ? [{} as RouteOptions, first] : [first, second!];
  return async (req, ctx) => {
    let res: Response;
    try {
      guardRequest(req, options);
      res = await handler(req, ctx);
    } catch (error) {
      const { status, body, extra, headers } = toErrorBody(error);
      res = NextResponse.json({ ...body, ...extra }, { status, headers });
    }
    return withPrivateHeaders(res);
  };
}

function guardRequest(req: Request, options: RouteOptions): void {
  if (options.origin !== "any") assertSameOrigin(req);
  const maxBytes =
    typeof options.maxBytes === "function"
      ? options.maxBytes()
      : (options.maxBytes ?? DEFAULT_BODY_LIMITS.maxBytes);
  limitsByRequest.set(req, {
    maxBytes,
    maxDepth: options.maxDepth ?? DEFAULT_BODY_LIMITS.maxDepth,
  });
  const accepts = options.accepts ?? "json";
  if (declaresBody(req) && accepts !== "any") {
    const type = mediaTypeOf(req);
    const ok = accepts === "json" ? type === "application/json" : type === "multipart/form-data";
    if (!ok) throw new HttpError(415, "unsupported_media_type", UNSUPPORTED[accepts]);
  }
  assertDeclaredLength(req, maxBytes);
}

/** The body limits `route()` set for this request (the defaults outside a wrapped handler). */
export function bodyLimitsOf(req: Request): BodyLimits {
  return limitsByRequest.get(req) ?? DEFAULT_BODY_LIMITS;
}

/**
 * Reads a JSON body within the route's limits: only `application/json` (415), at most `maxBytes`
 * read (413), nesting checked before parsing (400 `too_deep`), then JSON.parse (400 `bad_json`).
 */
export async function readJson(req: Request): Promise<unknown> {
  assertJsonType(req);
  const { maxBytes, maxDepth } = bodyLimitsOf(req);
  return parseJsonText(await readBodyText(req, maxBytes), maxDepth);
}

/**
 * A JSON body that may be left out entirely (an empty POST is `{}`); anything present must be
 * JSON, read within the route's limits.
 */
export async function readOptionalJson(req: Request): Promise<unknown> {
  const { maxBytes, maxDepth } = bodyLimitsOf(req);
  const text = await readBodyText(req, maxBytes);
  if (text.trim() === "") return {};
  assertJsonType(req);
  return parseJsonText(text, maxDepth);
}

/** Reads a JSON body (see `readJson`) and parses it with the schema (422 by field). */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  return schema.parse(await readJson(req));
}

/** Parses a numeric id from the path; anything else is a 404, not a 500. */
export function parseId(value: string | undefined): number {
  const id = Number(value);
  if (!value || !/^\d{1,12}$/.test(value) || !Number.isSafeInteger(id) || id < 1) {
    throw new HttpError(404, "not_found", "No such record.");
  }
  return id;
}

export function json(data: unknown, status = 200): Response {
  return withPrivateHeaders(NextResponse.json(data, { status }));
}
