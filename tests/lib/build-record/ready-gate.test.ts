import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import {
  assertRequestsSettled,
  createBuildRequest,
  OpenRequestsError,
  setBuildRequestState,
} from "@/lib/build-record/requests";
import { addTestCustomer, freshDb } from "../../helpers/db";

let db: DB;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  const customer = await addTestCustomer(db);
  job = await createJob(
    db,
    { customerId: customer.id, engine: "Invented flat six", status: "checking" },
    null,
  );
});

describe("assertRequestsSettled (the ready gate)", () => {
  it("passes with no requests, and for moves that are not to ready or collected", async () => {
    await expect(assertRequestsSettled(db, job, "ready")).resolves.toBeUndefined();
    await createBuildRequest(db, { jobId: job.id, text: "Keep the old pistons" }, null);
    await expect(assertRequestsSettled(db, job, "balancing")).resolves.toBeUndefined();
    await expect(assertRequestsSettled(db, job, undefined)).resolves.toBeUndefined();
    // A job already ready is not moved by saving its notes.
    await expect(
      assertRequestsSettled(db, { ...job, status: "ready" }, "ready"),
    ).resolves.toBeUndefined();
  });

  it("refuses ready and collected with a 409 naming every open request, in order", async () => {
    await createBuildRequest(db, { jobId: job.id, text: "Keep the old pistons" }, null);
    const second = await createBuildRequest(db, { jobId: job.id, text: "Paint the block" }, null);
    await createBuildRequest(db, { jobId: job.id, text: "Return the old bearings" }, null);
    await setBuildRequestState(
      db,
      { jobId: job.id, id: second.id, baseVersion: 1, state: "done", note: null },
      null,
    );
    for (const to of ["ready", "collected"] as const) {
      const error = await assertRequestsSettled(db, job, to).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(OpenRequestsError);
      const e = error as OpenRequestsError;
      expect(e.status).toBe(409);
      expect(e.message).toMatch(/2 customer requests are neither done nor explained/);
      expect(e.message.indexOf("Keep the old pistons")).toBeLessThan(
        e.message.indexOf("Return the old bearings"),
      );
      expect(e.message).not.toContain("Paint the block");
    }
  });

  it("an explained request no longer holds the job", async () => {
    const r = await createBuildRequest(db, { jobId: job.id, text: "Keep the old pistons" }, null);
    await setBuildRequestState(
      db,
      {
        jobId: job.id,
        id: r.id,
        baseVersion: 1,
        state: "explained",
        note: "Cracked at a pin boss",
      },
      null,
    );
    await expect(assertRequestsSettled(db, job, "ready")).resolves.toBeUndefined();
  });
});
