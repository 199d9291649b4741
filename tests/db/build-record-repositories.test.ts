import { readFileSync } from "node:fs";
import { beforeEach, describe, expect, it } from "vitest";
import {
  findBuildSection,
  findBuildSettings,
  insertBuildSection,
  updateBuildSection,
} from "@/db/build-record";
import type { DB } from "@/db/client";
import { StaleWriteError } from "@/db/errors";
import type { Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import { storeBuildSettings, writeBuildSection } from "@/lib/build-record/record";
import { EMPTY_BUILD_SETTINGS } from "@/lib/build-record/settings-schema";
import { addTestCustomer, freshDb } from "../helpers/db";

let db: DB;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  const customer = await addTestCustomer(db);
  job = await createJob(db, { customerId: customer.id, engine: "Invented flat six" }, null);
});

const read = (path: string) => readFileSync(new URL(`../../${path}`, import.meta.url), "utf8");

describe("build record layers", () => {
  it("db/build-record.ts opens no transaction, takes no lock and writes no audit entry", () => {
    const text = read("db/build-record.ts");
    expect(text).not.toMatch(/\.transaction\(/);
    expect(text).not.toMatch(/lockJob|createAuditEntry|StaleWriteError|NotFoundError/);
    expect(text).not.toMatch(/from "@\/lib\//);
  });

  it.each([
    "lib/build-record/record.ts",
    "lib/build-record/requests.ts",
    "lib/build-record/card.ts",
  ])("%s builds no SQL of its own", (path) => {
    expect(read(path)).not.toMatch(/\b(selectFrom|updateTable|insertInto|deleteFrom)\(|sql`/);
  });
});

describe("build section writes", () => {
  const tdc = { firstStop: "-18", secondStop: "22" };

  it("the repository changes nothing when the stored version has moved on", async () => {
    await insertBuildSection(
      db,
      { jobId: job.id, section: "tdc", data: tdc, version: 1 },
      null,
      "t",
    );
    const next = { firstStop: "-18.5", secondStop: "22" };
    const write = { jobId: job.id, section: "tdc" as const, data: next };
    expect(await updateBuildSection(db, { ...write, baseVersion: 1 }, null, "t")).toBe(true);
    expect(await updateBuildSection(db, { ...write, baseVersion: 1 }, null, "t")).toBe(false);
    expect(await findBuildSection(db, job.id, "tdc")).toEqual({ data: next, version: 2 });
  });

  it("the service refuses a write on an older version with the stored one (409)", async () => {
    const write = { jobId: job.id, section: "tdc" as const, data: tdc, baseVersion: 0 };
    await db.transaction().execute((trx) => writeBuildSection(trx, write, null));
    const again = db.transaction().execute((trx) => writeBuildSection(trx, write, null));
    await expect(again).rejects.toBeInstanceOf(StaleWriteError);
    await expect(again).rejects.toMatchObject({ currentVersion: 1 });
  });

  it("a second first save of the shop's settings is stale, and the first stays", async () => {
    await storeBuildSettings(db, { data: EMPTY_BUILD_SETTINGS, baseVersion: 0 }, null);
    const second = storeBuildSettings(db, { data: { other: true }, baseVersion: 0 }, null);
    await expect(second).rejects.toMatchObject({ currentVersion: 1 });
    expect((await findBuildSettings(db)).data).toEqual(EMPTY_BUILD_SETTINGS);
  });
});
