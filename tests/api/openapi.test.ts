import { describe, expect, it } from "vitest";
import { GET } from "@/app/api/openapi.json/route";

describe("GET /api/openapi.json", () => {
  it("describes the bench routes from the zod schemas, with their field rules", async () => {
    const doc = await (await GET()).json();
    expect(doc.openapi).toBe("3.1.0");
    const weights =
      doc.paths["/api/jobs/{id}/weights"].put.requestBody.content["application/json"].schema;
    expect(weights.required).toEqual(
      expect.arrayContaining(["cylinder", "kind", "phase", "readings", "version"]),
    );
    expect(JSON.stringify(weights)).toContain("^\\\\d{1,9}(\\\\.\\\\d{1,9})?$");
    const booking = doc.paths["/api/jobs"].post.requestBody.content["application/json"].schema;
    expect(JSON.stringify(booking)).toContain("v8-cross-plane");
  });
});

describe("the API description covers the code", () => {
  it("has an operation for every method of every route handler (found from the files)", async () => {
    const { readdirSync } = await import("node:fs");
    const path = await import("node:path");
    const root = path.join(process.cwd(), "app", "api");
    const files = (readdirSync(root, { recursive: true }) as string[]).filter(
      (f) => f.endsWith("route.ts") && !f.startsWith("auth"),
    );
    const doc = await (await GET()).json();
    const missing: string[] = [];
    for (const file of files) {
      const url =
        "/api/" +
        path
          .dirname(file)
          .replace(/\[([^\]]+)\]/g, "{$1}")
          .split(path.sep)
          .join("/");
      const mod = (await import(path.join(root, file))) as Record<string, unknown>;
      for (const method of ["GET", "POST", "PUT", "PATCH", "DELETE"]) {
        if (typeof mod[method] === "function" && !doc.paths[url]?.[method.toLowerCase()])
          missing.push(`${method} ${url}`);
      }
    }
    expect(missing).toEqual([]);
  });
});
