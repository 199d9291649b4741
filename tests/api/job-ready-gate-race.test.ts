import { beforeEach, describe, expect, it, vi } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { createBuildRequest } from "@/lib/build-record/requests";
import { createJob } from "@/lib/jobs/save";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

// A customer's request written down at the desk while the machinist moves the job to "ready":
// the ready gate (no "ready" while a request is open) must either see the request and refuse, or
// the request must land after the job went ready. It must never read "no open requests" and then
// let the job go ready over a request written in between.

const race = vi.hoisted(() => ({
  /** Runs once, right after the gate has read the open requests. */
  afterGateRead: null as null | ((reader: { isTransaction: boolean }) => Promise<void>),
}));

vi.mock("@/db/build-record", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/db/build-record")>();
  return {
    ...real,
    listOpenBuildRequests: async (...args: Parameters<typeof real.listOpenBuildRequests>) => {
      const open = await real.listOpenBuildRequests(...args);
      const hook = race.afterGateRead;
      race.afterGateRead = null;
      await hook?.(args[0]);
      return open;
    },
  };
});

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createJob(
    db,
    { customerId: users.customer.customerId!, engine: "Invented flat four", status: "checking" },
    null,
  );
});

/** The audit entries' order: which write reached the database first. */
async function auditOrder(): Promise<string[]> {
  const rows = await db
    .selectFrom("audit_log")
    .select(["entity", "action"])
    .where("entity", "in", ["job", "build_request"])
    .where("action", "in", ["update", "create"])
    .orderBy("id")
    .execute();
  return rows.map((r) => `${r.entity} ${r.action}`).filter((x) => x !== "job create");
}

describe("the ready gate and a request written at the same moment", () => {
  it("refuses ready over the request, or the request comes after ready; never ready over it", async () => {
    let added: Promise<unknown> = Promise.resolve();
    race.afterGateRead = async (reader) => {
      const write = createBuildRequest(db, { jobId: job.id, text: "Keep the old pistons" }, null);
      // Inside the gate's own transaction the write has to wait for it to finish (on SQLite for
      // the one connection, on PostgreSQL for the job's row lock); outside, it lands right here,
      // between the gate's read and the job's write.
      if (reader.isTransaction) added = write;
      else await write;
    };
    signInAs(users.machinist);
    const res = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, status: "ready" }),
      params({ id: String(job.id) }),
    );
    await added;
    expect(race.afterGateRead).toBeNull(); // the gate did read the requests
    const order = await auditOrder();
    if (res.status === 409) {
      expect((await res.json()).error.code).toBe("open_requests");
      expect(order).toEqual(["build_request create"]);
    } else {
      expect(res.status).toBe(200);
      expect(order).toEqual(["job update", "build_request create"]);
    }
  });
});
