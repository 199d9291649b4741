import { beforeEach, describe, expect, it } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { PATCH as patchRequest } from "@/app/api/jobs/[id]/build/requests/[requestId]/route";
import { GET as listRequests, POST as addRequest } from "@/app/api/jobs/[id]/build/requests/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { addTestUser } from "../../helpers/db";
import { setUpBuildJob } from "./fixtures";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob({ status: "checking" }));
  signInAs(users.counter);
});

type Req = { id: number; text: string; state: string; note: string | null; version: number };

async function add(text: unknown, jobId = job.id) {
  return addRequest(jsonRequest("POST", "/x", { text }), params({ id: String(jobId) }));
}

async function added(text: string): Promise<Req> {
  const res = await add(text);
  expect(res.status).toBe(201);
  return ((await res.json()) as { request: Req }).request;
}

function change(id: number, body: unknown, jobId = job.id) {
  return patchRequest(
    jsonRequest("PATCH", "/x", body),
    params({ id: String(jobId), requestId: String(id) }),
  );
}

async function moveJob(status: string) {
  const current = (
    await db.selectFrom("jobs").select("version").where("id", "=", job.id).executeTakeFirstOrThrow()
  ).version;
  return patchJob(
    jsonRequest("PATCH", "/x", { version: current, status }),
    params({ id: String(job.id) }),
  );
}

async function errorOf(res: Response) {
  return (
    (await res.json()) as {
      error: { code: string; message: string; fields?: Record<string, string> };
    }
  ).error;
}

describe("the customer's requests for the build", () => {
  it("the counter writes one down, it starts open, and the audit log keeps it", async () => {
    const r = await added("  Fit the vernier timing gear they brought  ");
    expect(r).toMatchObject({
      text: "Fit the vernier timing gear they brought",
      state: "open",
      version: 1,
    });
    const list = await listRequests(jsonRequest("GET", "/x"), params({ id: String(job.id) }));
    expect(((await list.json()) as { requests: Req[] }).requests.map((x) => x.text)).toEqual([
      "Fit the vernier timing gear they brought",
    ]);
    const audit = await listAuditEntries(db, "build_request", `${job.id}:${r.id}`);
    expect(audit).toHaveLength(1);
  });

  it("refuses an empty request by field (422)", async () => {
    const res = await add("   ");
    expect(res.status).toBe(422);
    expect(Object.keys((await errorOf(res)).fields!)).toEqual(["text"]);
  });

  it("a customer cannot write one (403); another customer's job is 404", async () => {
    signInAs(users.customer);
    expect((await add("Use the supplied bolts")).status).toBe(403);
    const other = await addTestUser(db, "customer");
    signInAs(other);
    const list = await listRequests(jsonRequest("GET", "/x"), params({ id: String(job.id) }));
    expect(list.status).toBe(404);
  });

  it("the counter cannot tick a request (403); the machinist can; a missing one is 404", async () => {
    const r = await added("Use the supplied bolts");
    expect((await change(r.id, { version: 1, state: "done" })).status).toBe(403);
    signInAs(users.machinist);
    const res = await change(r.id, { version: 1, state: "done" });
    expect(res.status).toBe(200);
    expect(((await res.json()) as { request: Req }).request).toMatchObject({
      state: "done",
      version: 2,
    });
    expect((await change(9999, { version: 1, state: "done" })).status).toBe(404);
  });

  it("explaining needs the reason, named by field (422)", async () => {
    const r = await added("Use the supplied bolts");
    signInAs(users.machinist);
    const res = await change(r.id, { version: 1, state: "explained", note: "" });
    expect(res.status).toBe(422);
    expect(Object.keys((await errorOf(res)).fields!)).toEqual(["note"]);
  });

  it("a change based on an older version is refused (409), the stored one kept", async () => {
    const r = await added("Use the supplied bolts");
    signInAs(users.machinist);
    expect((await change(r.id, { version: 1, state: "done" })).status).toBe(200);
    const stale = await change(r.id, { version: 1, state: "explained", note: "bolts stretched" });
    expect(stale.status).toBe(409);
    const row = await db.selectFrom("build_requests").selectAll().executeTakeFirstOrThrow();
    expect(row.state).toBe("done");
  });
});

describe("the ready gate where the job's state changes", () => {
  it("refuses 'ready' while a request is open (409 naming it), and allows it once settled", async () => {
    const bolts = await added("Use the supplied bolts");
    const gear = await added("Fit the vernier timing gear they brought");
    signInAs(users.machinist);
    await change(bolts.id, { version: 1, state: "done" });
    const refused = await moveJob("ready");
    expect(refused.status).toBe(409);
    const error = await errorOf(refused);
    expect(error.code).toBe("open_requests");
    expect(error.message).toContain("Fit the vernier timing gear they brought");
    expect(error.message).not.toContain("Use the supplied bolts");
    expect(error.fields).toHaveProperty("status");
    const still = await db.selectFrom("jobs").select("status").executeTakeFirstOrThrow();
    expect(still.status).toBe("checking");

    await change(gear.id, { version: 1, state: "explained", note: "Gear not for this cam drive" });
    expect((await moveJob("ready")).status).toBe(200);
  });

  it("refuses going straight to 'collected' too, and lets other moves through", async () => {
    await added("Use the supplied bolts");
    signInAs(users.machinist);
    expect((await moveJob("collected")).status).toBe(409);
    expect((await moveJob("balancing")).status).toBe(200);
  });

  it("a job with no requests moves to ready as before", async () => {
    signInAs(users.machinist);
    expect((await moveJob("ready")).status).toBe(200);
  });
});
