import { beforeEach, describe, expect, it } from "vitest";
import { POST as postCard } from "@/app/api/jobs/[id]/cards/route";
import { GET as getStatus } from "@/app/api/jobs/[id]/cards/status/route";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { PUT as putRotating } from "@/app/api/jobs/[id]/rotating/[part]/route";
import { PUT as putTarget } from "@/app/api/jobs/[id]/targets/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import type { DB } from "@/db/client";
import { findJobById, type Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { CardStatus } from "@/lib/cards/status";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { createFourCylinderJob } from "./fixtures";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createFourCylinderJob(db, users.customer.customerId!);
  signInAs(users.machinist);
});

const id = () => params({ id: String(job.id) });

async function status(): Promise<CardStatus> {
  const res = await getStatus(jsonRequest("GET", `/api/jobs/${job.id}/cards/status`), id());
  expect(res.status).toBe(200);
  return (await res.json()).status;
}

async function issue(body: unknown = {}) {
  const res = await postCard(jsonRequest("POST", `/api/jobs/${job.id}/cards`, body), id());
  expect(res.status).toBe(201);
  return (await res.json()).card;
}

function weigh(cylinder: number, readings: string[], version: number) {
  return putWeight(
    jsonRequest("PUT", "/x", { cylinder, kind: "piston", phase: "initial", readings, version }),
    id(),
  );
}

describe("a card that no longer matches the job", () => {
  it("matches right after issue, and has nothing to compare before any card", async () => {
    expect(await status()).toMatchObject({ current: null, stale: false, nextRevision: 1 });
    await issue();
    expect(await status()).toMatchObject({
      current: { revision: 1 },
      stale: false,
      changed: [],
      nextRevision: 2,
    });
  });

  it("is flagged after a weight changes, and a re-issue clears it", async () => {
    await issue();
    // Cylinder 2's piston 401.2 retyped as 401.1 (fixture weights were saved at version 1).
    expect((await weigh(2, ["401.1"], 1)).status).toBe(200);
    const stale = await status();
    expect(stale).toMatchObject({
      stale: true,
      changed: ["weights"],
      message: "Changed since revision 1 was issued: weights.",
      blocker: null,
      exceptions: [],
      nextRevision: 2,
    });
    await issue();
    expect(await status()).toMatchObject({ current: { revision: 2 }, stale: false });
  });

  it("is not flagged when the same figures are saved again (versions are not data)", async () => {
    await issue();
    expect((await weigh(2, ["401.2"], 1)).status).toBe(200);
    expect((await status()).stale).toBe(false);
  });

  it("names targets, job settings and rotating-part records when they change", async () => {
    await issue();
    await putTarget(
      jsonRequest("PUT", "/x", { kind: "wristPin", target: "100.0", version: 0 }),
      id(),
    );
    expect((await status()).changed).toEqual(["targets"]);

    const current = (await findJobById(db, job.id))!;
    const patched = await patchJob(
      jsonRequest("PATCH", "/x", { version: current.version, spec: { tolerance: "0.4" } }),
      id(),
    );
    expect(patched.status).toBe(200);
    await putRotating(
      jsonRequest("PUT", "/x", { data: { massKg: "24.5", rpm: 7000 }, version: 0 }),
      params({ id: String(job.id), part: "crankshaft" }),
    );
    const s = await status();
    expect(s.changed).toEqual(["targets", "settings", "rotating"]);
    expect(s.message).toBe(
      "Changed since revision 1 was issued: targets, job settings, crank and rotating-part records.",
    );
  });

  it("says what a re-issue would need: an override for parts outside the band", async () => {
    await issue();
    // Target 400.2 for pistons makes cylinder 1's 400.0 light.
    await putTarget(
      jsonRequest("PUT", "/x", { kind: "piston", target: "400.2", version: 0 }),
      id(),
    );
    const s = await status();
    expect(s.stale).toBe(true);
    expect(s.exceptions).toEqual(["cylinder 1 piston light (400.0 g against the target 400.20 g)"]);
  });

  it("is for shop staff only", async () => {
    signInAs(users.customer);
    const res = await getStatus(jsonRequest("GET", "/x"), id());
    expect(res.status).toBe(403);
    signInAs(users.counter);
    expect((await getStatus(jsonRequest("GET", "/x"), id())).status).toBe(200);
  });
});
