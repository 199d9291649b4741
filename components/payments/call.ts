import { ApiError, apiFetch } from "@/lib/api-client";

/** What one of our payment routes answered: the data, or the refusal and the message to show. */
export type CallOutcome<T> =
  { ok: true; data: T } | { ok: false; message: string; status: number | null; error: ApiError };

/**
 * Calls a payment route through the one API client (lib/api-client.ts) and turns its refusal into
 * one message to show (the client's own words when the server was not reached). The refusal is
 * kept, so a screen can tell a stale write (see components/ui/changed-elsewhere.tsx).
 */
export async function callPayments<T>(
  url: string,
  method: "GET" | "POST",
  body?: unknown,
): Promise<CallOutcome<T>> {
  try {
    return { ok: true, data: await apiFetch<T>(url, { method, body }) };
  } catch (e) {
    if (!(e instanceof ApiError)) throw e;
    const fields = Object.values(e.fields).join(" ");
    return {
      ok: false,
      status: e.status === 0 ? null : e.status,
      message: [e.message, fields].filter(Boolean).join(" "),
      error: e,
    };
  }
}
