/** What a billing call from the browser comes back as: the data, or messages to show. */
export type ApiOutcome<T> = { ok: true; data: T } | { ok: false; message: string };

function fieldLabel(key: string): string {
  const line = /^lines\.(\d+)\.?(.*)$/.exec(key);
  if (line) return `Line ${Number(line[1]) + 1}${line[2] ? ` (${line[2]})` : ""}`;
  return key === "_" ? "" : key;
}

/** Calls one of our billing routes with JSON and turns the error shape into one message. */
export async function callApi<T>(
  url: string,
  method: string,
  body?: unknown,
): Promise<ApiOutcome<T>> {
  try {
    const res = await fetch(url, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    if (res.status === 204) return { ok: true, data: undefined as T };
    const json = (await res.json().catch(() => null)) as
      | (T & { error?: undefined })
      | { error: { message: string; fields?: Record<string, string> } }
      | null;
    if (res.ok && json && !json.error) return { ok: true, data: json as T };
    const error = json?.error;
    const fields = error?.fields
      ? Object.entries(error.fields)
          .map(([k, m]) => [fieldLabel(k), m].filter(Boolean).join(": "))
          .join(" ")
      : "";
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
