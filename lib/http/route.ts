import { NextResponse } from "next/server";
import type { z } from "zod";
import { HttpError } from "./errors";
import { toErrorBody } from "./to-error-body";

type Context<P> = { params: Promise<P> };
type Handler<P> = (req: Request, ctx: Context<P>) => Promise<Response>;

/** Wraps a route handler so every failure leaves as the one error shape with the right status. */
export function route<P = Record<string, string>>(handler: Handler<P>): Handler<P> {
  return async (req, ctx) => {
    try {
      return await handler(req, ctx);
    } catch (error) {
      const { status, body, extra } = toErrorBody(error);
      return NextResponse.json({ ...body, ...extra }, { status });
    }
  };
}

/** Reads a JSON body and parses it with the schema; a body that is not JSON is a 400. */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.infer<S>> {
  let raw: unknown;
  try {
    raw = await req.json();
  } catch {
    throw new HttpError(400, "bad_json", "The request body is not valid JSON.");
  }
  return schema.parse(raw);
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
  return NextResponse.json(data, { status });
}
