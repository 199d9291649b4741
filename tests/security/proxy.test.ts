import { createRequire } from "node:module";
import { NextRequest } from "next/server";
import { describe, expect, it } from "vitest";
import { config, isReadablePath, proxy } from "@/proxy";

// What the proxy answers, and which paths Next.js runs it for (compiled by Next's own function,
// which its published types leave out).
const { getMiddlewareMatchers } = createRequire(import.meta.url)(
  "next/dist/build/analysis/get-page-static-info",
) as { getMiddlewareMatchers: (matcher: string[], config: object) => { regexp: string }[] };
const matchers = getMiddlewareMatchers(config.matcher, {});
const runsFor = (path: string) => matchers.some((m) => new RegExp(m.regexp).test(path));

describe("the proxy", () => {
  it("answers a path with a broken %-escape with 400, never 500", async () => {
    // %C3 starts a two-byte UTF-8 character and %28 cannot end one; %ZZ is no escape at all.
    for (const path of ["/jobs/%C3%28", "/verify/%ZZ", "/%C3%28"]) {
      expect(isReadablePath(path)).toBe(false);
      const res = await proxy(new NextRequest(`http://localhost:3000${path}`));
      expect(res.status, path).toBe(400);
    }
    const api = await proxy(new NextRequest("http://localhost:3000/api/verify/%C3%28"));
    expect(api.status).toBe(400);
    expect(await api.json()).toEqual({
      error: { code: "bad_path", message: expect.stringContaining("%-escape") },
    });
    expect(isReadablePath("/verify/7KQ2M%2D9XW4D")).toBe(true);
  });

  it("runs for pages and for API paths carrying a %-escape", () => {
    for (const path of ["/", "/jobs", "/jobs/%C3%28", "/verify/abc", "/api/verify/%C3%28"]) {
      expect(runsFor(path), path).toBe(true);
    }
  });

  it("never runs for the API's ordinary paths, so their bodies are never cut at its 10 MB copy limit", () => {
    // Next copies the body of every request the proxy runs for, up to proxyClientMaxBodySize
    // (10 MB by default), and passes on only that much: an upload under UPLOAD_MAX_MB = 50 was cut.
    for (const path of [
      "/api/jobs/12/uploads",
      "/api/settings/logo",
      "/api/verify/check",
      "/api/users",
    ]) {
      expect(runsFor(path), path).toBe(false);
    }
  });
});
