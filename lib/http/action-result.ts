import { ZodError } from "zod";
import { fieldsFromZod, toErrorBody } from "./to-error-body";

/** What every server action returns to `useActionState`: expected failures are values. */
export type ActionResult<T = undefined> =
  | { ok: true; data: T; message?: string }
  | {
      ok: false;
      status: number;
      message: string;
      fields?: Record<string, string>;
      /** The error code of the one error shape ("stale_write", "conflict"…), where known. */
      code?: string;
    };

export function toActionFailure(error: unknown): ActionResult<never> {
  if (error instanceof ZodError) {
    return {
      ok: false,
      status: 422,
      message: "Some fields need attention.",
      fields: fieldsFromZod(error),
    };
  }
  const { status, body } = toErrorBody(error);
  return {
    ok: false,
    status,
    message: body.error.message,
    fields: body.error.fields,
    code: body.error.code,
  };
}
