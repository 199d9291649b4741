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

describe("the request guard's refusals", () => {
  it("are listed on every state-changing route: 403, 413 and 415 in the one error shape", async () => {
    const doc = await (await GET()).json();
    const errorRef =
      doc.paths["/api/users"].post.responses["401"].content["application/json"].schema;
    const missing: string[] = [];
    let changing = 0;
    type Operation = {
      responses?: Record<string, { content?: Record<string, { schema?: unknown }> }>;
    };
    for (const [url, item] of Object.entries(
      doc.paths as Record<string, Record<string, Operation>>,
    )) {
      for (const method of ["post", "put", "patch", "delete"]) {
        const responses = item[method]?.responses;
        if (!responses) continue;
        changing++;
        for (const status of ["403", "413", "415"]) {
          const schema = responses[status]?.content?.["application/json"]?.schema;
          if (JSON.stringify(schema) !== JSON.stringify(errorRef))
            missing.push(`${method.toUpperCase()} ${url} ${status}`);
        }
      }
    }
    expect(changing).toBeGreaterThan(50);
    expect(missing).toEqual([]);
    // The guard's codes are named where a reader looks for them.
    const upload = doc.paths["/api/jobs/{id}/uploads"].post.responses;
    expect(upload["403"].description).toContain("cross_site");
    expect(upload["413"].description).toContain("too_large");
    expect(upload["415"].description).toContain("unsupported_media_type");
  });

  it("are not claimed for reads, which the guard lets through whatever their origin", async () => {
    const doc = await (await GET()).json();
    expect(doc.paths["/api/jobs"].get.responses["413"]).toBeUndefined();
    expect(doc.paths["/api/jobs"].get.responses["415"]).toBeUndefined();
  });
});
