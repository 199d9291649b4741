import { describe, expect, it } from "vitest";
import { GET } from "@/app/api/health/route";
import { setDb } from "@/db/client";
import { latestMigration } from "@/db/migrate";
import { emptyDb, freshDb } from "../helpers/db";

describe("GET /api/health", () => {
  it("reports the database reachable and at the latest migration", async () => {
    await freshDb();
    const res = await GET();
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({
      status: "ok",
      database: "reachable",
      migration: latestMigration,
      latestMigration,
    });
  });

  it("answers 503 when the database has not been migrated", async () => {
    setDb(await emptyDb());
    const res = await GET();
    expect(res.status).toBe(503);
    expect(await res.json()).toMatchObject({ status: "needs-migration", migration: null });
  });
});
