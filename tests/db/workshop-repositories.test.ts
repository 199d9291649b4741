import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { NotFoundError, StaleWriteError } from "@/db/errors";
import { findJobById, type Job, updateJobRow } from "@/db/jobs";
import { listAuditEntries } from "@/db/audit";
import {
  deletePartWeight,
  findPartTarget,
  findPartWeight,
  findRotatingRecord,
  insertPartTarget,
  insertPartWeight,
  insertRotatingRecord,
  updatePartTarget,
  updatePartWeight,
  updateRotatingRecord,
} from "@/db/weights";
import { createJob, keepOneOilAllowance, updateJob } from "@/lib/jobs/save";
import { addTestCustomer, freshDb } from "../helpers/db";

// The repositories' own guard: a versioned write is UPDATE … WHERE id AND version, and a write
// that touched no row says why (moved on: StaleWriteError with the version now stored; gone:
// NotFoundError). The services check the version first under the job's lock; this is the second
// line, and what a caller without the lock would meet. Versions are counted by hand: a row is
// stored at 1 and each write moves it on by one.

let db: DB;
let job: Job;
const AT = "2026-12-02T08:00:00.000Z";

beforeEach(async () => {
  db = await freshDb();
  const customer = await addTestCustomer(db);
  job = await createJob(db, { customerId: customer.id, engine: "Inline four" }, null);
});

describe("a job's write", () => {
  it("moves the version on by one, and refuses a writer still at the old one", async () => {
    const changes = { engine: "Inline four, 2.0", notes: null, status: job.status, spec: {} };
    await updateJobRow(db, job.id, 1, { ...changes, updatedAt: AT });
    expect((await findJobById(db, job.id))?.version).toBe(2); // 1 + 1
    const late = updateJobRow(db, job.id, 1, { ...changes, engine: "late", updatedAt: AT });
    await expect(late).rejects.toBeInstanceOf(StaleWriteError);
    await expect(late).rejects.toMatchObject({ currentVersion: 2 });
    expect((await findJobById(db, job.id))?.engine).toBe("Inline four, 2.0");
  });

  it("names a job that is not there as not found", async () => {
    const changes = { engine: "x", notes: null, status: job.status, spec: {}, updatedAt: AT };
    await expect(updateJobRow(db, job.id + 99, 1, changes)).rejects.toBeInstanceOf(NotFoundError);
  });

  it("through the service: a stale version writes nothing, not even a history entry", async () => {
    await updateJob(db, job.id, 1, { notes: "first" }, null);
    await expect(updateJob(db, job.id, 1, { notes: "second" }, null)).rejects.toMatchObject({
      currentVersion: 2,
    });
    expect((await findJobById(db, job.id))?.notes).toBe("first");
    const history = await listAuditEntries(db, "job", job.id);
    expect(history.map((h) => h.action)).toEqual(["update", "create"]);
  });
});

describe("a part's weight", () => {
  const key = () => ({
    jobId: job.id,
    cylinder: 1,
    kind: "piston" as const,
    phase: "initial" as const,
  });
  const values = (readings: string[]) => ({
    readings,
    confirmedOutlier: false,
    updatedBy: null,
    updatedAt: AT,
  });

  it("is stored at 1, moved on by one per write, and a writer at the old version is refused", async () => {
    await insertPartWeight(db, key(), values(["512.4"]));
    const stored = (await findPartWeight(db, key()))!;
    expect(stored.version).toBe(1);
    await updatePartWeight(db, stored.id, 1, values(["512.6"]));
    const late = updatePartWeight(db, stored.id, 1, values(["999.9"]));
    await expect(late).rejects.toBeInstanceOf(StaleWriteError);
    await expect(late).rejects.toMatchObject({ currentVersion: 2 });
    expect((await findPartWeight(db, key()))?.readings).toEqual(["512.6"]);
  });

  it("is cleared only at the version read", async () => {
    await insertPartWeight(db, key(), values(["512.4"]));
    const stored = (await findPartWeight(db, key()))!;
    await updatePartWeight(db, stored.id, 1, values(["512.5"]));
    await expect(deletePartWeight(db, stored.id, 1)).rejects.toMatchObject({ currentVersion: 2 });
    await deletePartWeight(db, stored.id, 2);
    expect(await findPartWeight(db, key())).toBeUndefined();
  });
});

describe("a target and a rotating-part record", () => {
  it("refuse a target write at a version someone has moved on from", async () => {
    await insertPartTarget(db, job.id, "bigEnd", "410.0");
    await updatePartTarget(db, job.id, "bigEnd", 1, "409.5");
    await expect(updatePartTarget(db, job.id, "bigEnd", 1, "400.0")).rejects.toMatchObject({
      currentVersion: 2,
    });
    expect(await findPartTarget(db, job.id, "bigEnd")).toEqual({
      kind: "bigEnd",
      target: "409.5",
      version: 2,
    });
  });

  it("refuse a rotating-part record write at a version someone has moved on from", async () => {
    const first = { data: { note: "first" }, updatedBy: null, updatedAt: AT };
    await insertRotatingRecord(db, job.id, "crankshaft", first);
    await updateRotatingRecord(db, job.id, "crankshaft", 1, { ...first, data: { note: "second" } });
    const late = updateRotatingRecord(db, job.id, "crankshaft", 1, {
      ...first,
      data: { note: "x" },
    });
    await expect(late).rejects.toBeInstanceOf(StaleWriteError);
    await expect(late).rejects.toMatchObject({ currentVersion: 2 });
    expect((await findRotatingRecord(db, job.id, "crankshaft"))?.data).toEqual({ note: "second" });
  });
});

describe("the oil allowance is kept one way at a time (the job's settings)", () => {
  it("a per-rod figure clears the per-crankpin one, a per-crankpin figure alone clears the per-rod one", () => {
    expect(keepOneOilAllowance({ oilAllowancePerRod: "2" })).toEqual({
      oilAllowancePerRod: "2",
      oilAllowance: "0",
    });
    expect(keepOneOilAllowance({ oilAllowance: "4" })).toEqual({
      oilAllowance: "4",
      oilAllowancePerRod: null,
    });
    // Neither sent: both left as stored.
    expect(keepOneOilAllowance({ massUnit: "oz" })).toEqual({ massUnit: "oz" });
  });
});
