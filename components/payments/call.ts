/** What one of our payment routes answered: the data, or the message to show. */
export type CallOutcome<T> = { ok: true; data: T } | { ok: false; message: string };

/** Calls a payment route with JSON and turns the error shape into one message to show. */
export async function callPayments<T>(
  url: string,
  method: "GET" | "POST",
  body?: unknown,
): Promise<CallOutcome<T>> {
  try {
    const res = await fetch(url, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const json = (await res.json().catch(() => null)) as
      | (T & { error?: undefined })
      | { error: { message: string; fields?: Record<string, string> } }
      | null;
    if (res.ok && json && !json.error) return { ok: true, data: json as T };
    const error = json?.error;
    const fields = error?.fields ? Object.values(error.fields).join(" ") : "";
    return {
      ok: false,
      message: [error?.message ?? `The server answered ${res.status}.`, fields]
        .filter(Boolean)
        .join(" "),
    };
  } catch {
    return {
      ok: false,
      message: "Could not reach the server. Check the connection and try again.",
    };
  }
}
