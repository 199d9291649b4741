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
