import path from "node:path";
import { describe, expect, it } from "vitest";

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

describe("security headers", () => {
  it("apply to every path, pages, API and static files alike", async () => {
    const rules = await configuredHeaders();
    expect(rules).toHaveLength(1);
    expect(rules[0]!.source).toBe("/:path*");
  });

  it("forbid framing, sniffing, full referrers and unused device features", async () => {
    const headers = new Map((await configuredHeaders())[0]!.headers.map((h) => [h.key, h.value]));
    expect(headers.get("X-Content-Type-Options")).toBe("nosniff");
    expect(headers.get("X-Frame-Options")).toBe("DENY");
    expect(headers.get("Referrer-Policy")).toBe("strict-origin-when-cross-origin");
    expect(headers.get("Permissions-Policy")).toContain("camera=()");
    expect(headers.get("Permissions-Policy")).toContain("microphone=()");
    expect(headers.get("Permissions-Policy")).toContain("geolocation=()");
  });

  it("set a content security policy that loads only from the app itself", async () => {
    const csp = (await configuredHeaders())[0]!.headers.find(
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
