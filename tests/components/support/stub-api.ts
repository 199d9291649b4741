import { vi } from "vitest";

// The API as a component test sees it: every fetch recorded (method, URL, JSON body) and answered
// by the test's own function with a status and a JSON body, as our route handlers answer.

export interface ApiCall<B = unknown> {
  method: string;
  url: string;
  body: B | null;
}

export type ApiAnswer<B = unknown> = (call: ApiCall<B>) => { status: number; body: unknown };

/**
 * Stubs the global fetch until `vi.unstubAllGlobals()`. Answers with `answer` as it is when each
 * call arrives (`api.answer = …` changes it for the calls after); `api.calls` lists every call.
 */
export function stubApi<B = unknown>(answer: ApiAnswer<B>) {
  const api = { calls: [] as ApiCall<B>[], answer };
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call: ApiCall<B> = {
      method: init.method ?? "GET",
      url,
      body:
        init.body === undefined || init.body instanceof FormData
          ? null
          : (JSON.parse(String(init.body)) as B),
    };
    api.calls.push(call);
    const { status, body } = api.answer(call);
    return new Response(JSON.stringify(body), {
      status,
      headers: { "content-type": "application/json" },
    });
  });
  return api;
}
