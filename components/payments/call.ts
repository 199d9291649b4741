import { ApiError, apiFetch } from "@/lib/api-client";

/** What one of our payment routes answered: the data, or the message to show. */
export type CallOutcome<T> =
  { ok: true; data: T } | { ok: false; message: string; status: number | null };

/**
 * Calls a payment route through the one API client (lib/api-client.ts) and turns the error shape
 * into one message to show.
 */
export async function callPayments<T>(
  url: string,
  method: "GET" | "POST",
  body?: unknown,
): Promise<CallOutcome<T>> {
  try {
    return { ok: true, data: await apiFetch<T>(url, { method, body }) };
  } catch (e) {
    if (!(e instanceof ApiError) || e.status === 0)
      return {
        ok: false,
        status: null,
        message: "Could not reach the server. Check the connection and try again.",
      };
    const fields = Object.values(e.fields).join(" ");
    return { ok: false, status: e.status, message: [e.message, fields].filter(Boolean).join(" ") };
  }
}
