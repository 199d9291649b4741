import { ZodError } from "zod";
import { ConflictError, NotFoundError, StaleWriteError } from "@/db/errors";
import { type ErrorBody, HttpError } from "./errors";

/** Field messages keyed by dotted path ("cylinders.2.piston"), first message per field. */
export function fieldsFromZod(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join(".") || "_";
    fields[key] ??= issue.message;
  }
  return fields;
}

/** Turns any thrown value into a status and the error body; unknown errors say nothing inside. */
export function toErrorBody(error: unknown): {
  status: number;
  body: ErrorBody;
  extra?: Record<string, unknown>;
  headers?: Record<string, string>;
} {
  if (error instanceof HttpError) {
    return {
      status: error.status,
      body: { error: { code: error.code, message: error.message, fields: error.fields } },
      headers: error.headers,
    };
  }
  if (error instanceof ZodError) {
    return {
      status: 422,
      body: {
        error: {
          code: "invalid_input",
          message: "Some fields need attention.",
          fields: fieldsFromZod(error),
        },
      },
    };
  }
  if (error instanceof NotFoundError) {
    return {
      status: 404,
      body: { error: { code: "not_found", message: `No such ${error.entity}.` } },
    };
  }
  if (error instanceof StaleWriteError) {
    return {
      status: 409,
      body: { error: { code: "stale_write", message: error.message } },
      extra: { currentVersion: error.currentVersion },
    };
  }
  if (error instanceof ConflictError) {
    return {
      status: 409,
      body: {
        error: {
          code: "conflict",
          message: error.message,
          fields: { [error.field]: error.message },
        },
      },
    };
  }
  if (isFieldError(error)) {
    return {
      status: 422,
      body: {
        error: {
          code: error.code,
          message: error.message,
          fields: { [error.field]: error.message },
        },
      },
    };
  }
  console.error("unexpected error", error);
  return {
    status: 500,
    body: { error: { code: "internal", message: "Something went wrong on the server." } },
  };
}

/** Domain errors from lib/ that name the offending field (the balance engine's among them). */
function isFieldError(error: unknown): error is Error & { field: string; code: string } {
  return (
    error instanceof Error &&
    typeof (error as { field?: unknown }).field === "string" &&
    typeof (error as { code?: unknown }).code === "string"
  );
}
