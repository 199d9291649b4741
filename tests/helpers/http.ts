/** Builds a Request as Next would hand it to a route handler. */
export function jsonRequest(method: string, url: string, body?: unknown): Request {
  return new Request(new URL(url, "http://localhost"), {
    method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body),
  });
}

export function params<P>(value: P): { params: Promise<P> } {
  return { params: Promise.resolve(value) };
}

export const noParams = params({});
