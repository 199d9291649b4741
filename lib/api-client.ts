import type { ErrorBody } from "@/lib/http/errors";

/** A refusal from our API, with the status and the one error shape. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ErrorBody & Record<string, unknown>,
  ) {
    super(body.error?.message ?? `Request failed (${status})`);
  }
  get fields(): Record<string, string> {
    return this.body.error?.fields ?? {};
  }
}

/** fetch for our JSON API: sends JSON, parses JSON, throws ApiError on any non-2xx answer. */
export async function apiFetch<T>(
  url: string,
  init: { method?: string; body?: unknown } = {},
): Promise<T> {
  const res = await fetch(url, {
    method: init.method ?? "GET",
    headers: init.body === undefined ? undefined : { "content-type": "application/json" },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
    credentials: "same-origin",
  });
  const fallback = {
    error: { code: "bad_response", message: `The server answered ${res.status}.` },
  };
  const data: unknown = await res.json().catch(() => fallback);
  if (!res.ok) throw new ApiError(res.status, data as ErrorBody & Record<string, unknown>);
  return data as T;
}
