import { createRequire } from "node:module";
import path from "node:path";
import { describe, expect, it } from "vitest";

// The matcher Next.js itself compiles a header rule's `source` with (it ships no types).
const { pathToRegexp } = createRequire(import.meta.url)("next/dist/compiled/path-to-regexp") as {
  pathToRegexp: (source: string, keys: unknown[], options: Record<string, unknown>) => RegExp;
};

type Header = { key: string; value: string };
type Rule = { source: string; headers: Header[] };

async function configuredHeaders(): Promise<Rule[]> {
  const file = path.resolve(import.meta.dirname, "../../next.config.mjs");
  const { default: config } = await import(file);
  return config.headers();
}

function directives(policy: string): Map<string, string[]> {
  return new Map(
    policy
      .split(";")
      .map((d) => d.trim().split(/\s+/))
      .filter((parts) => parts[0])
      .map(([name, ...values]) => [name!, values]),
  );
}

function cspRule(rules: Rule[]): Rule {
  return rules.find((r) => r.headers.some((h) => h.key === "Content-Security-Policy"))!;
}

const matches = (source: string, path: string) =>
  pathToRegexp(source, [], { strict: true, sensitive: false, delimiter: "/" }).test(path);

describe("security headers", () => {
  it("apply to every path, pages, API and static files alike", async () => {
    const rules = await configuredHeaders();
    expect(rules[0]!.source).toBe("/:path*");
    expect(rules[0]!.headers.map((h) => h.key)).toContain("X-Content-Type-Options");
  });

  it("leave out the page policy where a stored file is served with its own sandbox policy", async () => {
    // A header from next.config replaces the one the route set: an uploaded image lost its
    // `sandbox` this way. Checked with the matcher Next.js compiles the rule with.
    const { source } = cspRule(await configuredHeaders());
    for (const page of ["/", "/jobs", "/jobs/12", "/sign-in", "/api/health", "/api/settings"]) {
      expect(matches(source, page), page).toBe(true);
    }
    for (const file of ["/api/uploads/5", "/api/uploads/5/thumbnail", "/api/settings/logo"]) {
      expect(matches(source, file), file).toBe(false);
    }
  });

  it("forbid framing, sniffing, full referrers and unused device features", async () => {
    const headers = new Map(
      (await configuredHeaders()).flatMap((r) => r.headers).map((h) => [h.key, h.value]),
    );
    expect(headers.get("X-Content-Type-Options")).toBe("nosniff");
    expect(headers.get("X-Frame-Options")).toBe("DENY");
    expect(headers.get("Referrer-Policy")).toBe("strict-origin-when-cross-origin");
    expect(headers.get("Permissions-Policy")).toContain("camera=()");
    expect(headers.get("Permissions-Policy")).toContain("microphone=()");
    expect(headers.get("Permissions-Policy")).toContain("geolocation=()");
  });

  it("set a content security policy that loads only from the app itself", async () => {
    const csp = cspRule(await configuredHeaders()).headers.find(
      (h) => h.key === "Content-Security-Policy",
    )!.value;
    const d = directives(csp);
    expect(d.get("default-src")).toEqual(["'self'"]);
    expect(d.get("frame-ancestors")).toEqual(["'none'"]);
    expect(d.get("object-src")).toEqual(["'none'"]);
    expect(d.get("base-uri")).toEqual(["'self'"]);
    expect(d.get("form-action")).toEqual(["'self'"]);
    expect(d.get("img-src")).toEqual(["'self'", "data:", "blob:"]);
    expect(d.get("style-src")).toEqual(["'self'", "'unsafe-inline'"]);
    // Outside `next dev` nothing may be evaluated from strings.
    expect(d.get("script-src")).toEqual(["'self'", "'unsafe-inline'"]);
    for (const values of d.values()) expect(values.join(" ")).not.toMatch(/\*|https?:/);
  });
});
