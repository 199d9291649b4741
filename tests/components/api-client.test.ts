import { afterEach, describe, expect, it, vi } from "vitest";
import { ApiError, apiFetch } from "@/lib/api-client";

type Sent = { url: string; init: RequestInit };
let sent: Sent[];

function answerWith(response: () => Response | Promise<Response>) {
  sent = [];
  vi.stubGlobal("fetch", async (url: string, init: RequestInit) => {
    sent.push({ url, init });
    return response();
  });
}
afterEach(() => vi.unstubAllGlobals());

describe("apiFetch, the one way the browser talks to the API", () => {
  it("sends a value as JSON and reads the JSON answer", async () => {
    answerWith(() => Response.json({ job: { id: 9 } }));
    const answer = await apiFetch<{ job: { id: number } }>("/api/jobs/9", {
      method: "PATCH",
      body: { version: 3 },
    });
    expect(answer.job.id).toBe(9);
    expect(sent[0]!.init.body).toBe('{"version":3}');
    expect(new Headers(sent[0]!.init.headers).get("content-type")).toBe("application/json");
  });

  it("sends a file upload as multipart: the FormData itself, no JSON content type", async () => {
    answerWith(() => Response.json({ ok: true }));
    const form = new FormData();
    form.set("file", new Blob(["%PDF-1.7"], { type: "application/pdf" }), "card.pdf");
    await apiFetch("/api/verify/check", { method: "POST", body: form });
    expect(sent[0]!.init.body).toBe(form);
    // The browser writes multipart/form-data with its boundary only when no type is set.
    expect(new Headers(sent[0]!.init.headers).get("content-type")).toBeNull();
  });

  it("reads an empty answer (204) as undefined and a plain-text one as text", async () => {
    answerWith(() => new Response(null, { status: 204 }));
    await expect(apiFetch("/api/uploads/4", { method: "DELETE" })).resolves.toBeUndefined();
    answerWith(() => new Response("ok", { status: 200 }));
    await expect(apiFetch("/api/health")).resolves.toBe("ok");
  });

  it("throws the server's refusal in our error shape, with its status and fields", async () => {
    answerWith(() =>
      Response.json(
        {
          error: {
            code: "invalid_input",
            message: "Check the file.",
            fields: { file: "PNG or JPEG." },
          },
        },
        { status: 422 },
      ),
    );
    const refusal = await apiFetch("/api/settings/logo", {
      method: "PUT",
      body: new FormData(),
    }).catch((e: unknown) => e);
    expect(refusal).toBeInstanceOf(ApiError);
    expect((refusal as ApiError).status).toBe(422);
    expect((refusal as ApiError).fields).toEqual({ file: "PNG or JPEG." });
  });

  it("gives an answer that is not our shape (a proxy's HTML page) the one error shape", async () => {
    answerWith(() => new Response("<html>Bad gateway</html>", { status: 502 }));
    const refusal = (await apiFetch("/api/jobs").catch((e: unknown) => e)) as ApiError;
    expect(refusal.status).toBe(502);
    expect(refusal.body.error).toEqual({
      code: "bad_response",
      message: "The server answered 502.",
    });
  });

  it("turns no answer at all (the network dropped) into status 0, code unreachable", async () => {
    answerWith(() => Promise.reject(new TypeError("Failed to fetch")));
    const refusal = (await apiFetch("/api/jobs").catch((e: unknown) => e)) as ApiError;
    expect(refusal).toBeInstanceOf(ApiError);
    expect(refusal.status).toBe(0);
    expect(refusal.body.error.code).toBe("unreachable");
    expect(refusal.message).toContain("could not be reached");
  });
});
