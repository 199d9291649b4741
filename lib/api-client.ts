import type { ErrorBody } from "@/lib/http/errors";

/**
 * A refusal from our API, with the status and the one error shape. A request that never reached
 * the server (the network dropped) is status 0, code `unreachable`.
 */
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

/**
 * The one way the browser talks to our API. Sends JSON, or a FormData as multipart (the browser
 * sets its boundary); reads a JSON answer, an empty one (204: `undefined`) or plain text as such;
 * throws ApiError on any non-2xx answer, and on no answer at all (status 0).
 */
export async function apiFetch<T>(
  url: string,
  /** `body`: any value sent as JSON, or a FormData sent as multipart (a file upload). */
  init: { method?: string; body?: unknown } = {},
): Promise<T> {
  const multipart = typeof FormData !== "undefined" && init.body instanceof FormData;
  let res: Response;
  try {
    res = await fetch(url, {
      method: init.method ?? "GET",
      headers:
        init.body === undefined || multipart ? undefined : { "content-type": "application/json" },
      body:
        init.body === undefined
          ? undefined
          : multipart
            ? (init.body as FormData)
            : JSON.stringify(init.body),
      credentials: "same-origin",
    });
  } catch {
    throw new ApiError(0, {
      error: {
        code: "unreachable",
        message: "The server could not be reached. Check the connection and try again.",
      },
    });
  }
  const text = await res.text().catch(() => "");
  let data: unknown = undefined;
  if (text !== "") {
    try {
      data = JSON.parse(text);
    } catch {
      data = text;
    }
  }
  if (!res.ok) {
    const shaped =
      typeof data === "object" &&
      data !== null &&
      typeof (data as Partial<ErrorBody>).error?.message === "string";
    throw new ApiError(
      res.status,
      (shaped
        ? data
        : {
            error: { code: "bad_response", message: `The server answered ${res.status}.` },
          }) as ErrorBody & Record<string, unknown>,
    );
  }
  return data as T;
}
