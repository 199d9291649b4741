import { beforeEach, describe, expect, it } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { POST as applyPairing } from "@/app/api/jobs/[id]/pairing/route";
import { PUT as putRotating } from "@/app/api/jobs/[id]/rotating/[part]/route";
import { PUT as putTarget } from "@/app/api/jobs/[id]/targets/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import { POST as postJob } from "@/app/api/jobs/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { Workshop } from "@/lib/workshop/load";
import { addOneOfEachRole, addTestCustomer, countRows, freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

// A made-up in-line four, weights in grams.
const FOUR: Record<string, string[]> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

async function book(spec: Record<string, unknown>): Promise<Job> {
  signInAs(users.counter);
  const res = await postJob(
    jsonRequest("POST", "/api/jobs", {
      customerId: users.customer.customerId,
      engine: "test engine",
      spec,
    }),
    noParams,
  );
  expect(res.status).toBe(201);
  return (await res.json()).job;
}

async function weigh(
  jobId: number,
  cylinder: number,
  kind: PartKind,
  readings: string[],
  version = 0,
  phase = "initial",
) {
  return putWeight(
    jsonRequest("PUT", "/x", { cylinder, kind, phase, readings, version }),
    params({ id: String(jobId) }),
  );
}

async function weighAll(jobId: number, set: Record<string, string[]>) {
  signInAs(users.machinist);
  for (const [kind, values] of Object.entries(set)) {
    for (const [i, v] of values.entries())
      expect((await weigh(jobId, i + 1, kind as PartKind, [v])).status).toBe(200);
  }
}

async function workshop(jobId: number): Promise<Workshop> {
  const res = await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(jobId) }));
  expect(res.status).toBe(200);
  return res.json();
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await book({ layout: "inline-4", cylinders: 4, drillDiameterMm: "8" });
});

describe("booking in", () => {
  it("numbers jobs readably and in sequence, with the engine's settings", async () => {
    const second = await book({ layout: "v8-cross-plane", cylinders: 8, balanceFactor: "50" });
    expect(job.number).toMatch(/^\d{4}-0001$/);
    expect(second.number).toMatch(/^\d{4}-0002$/);
    expect(second.spec).toMatchObject({
      layout: "v8-cross-plane",
      cylinders: 8,
      tolerance: "0.5",
      massUnit: "g",
    });
  });

  it("refuses a spec that makes no sense, naming the fields, and writes nothing", async () => {
    const jobs = await countRows(db, "jobs");
    const res = await postJob(
      jsonRequest("POST", "/api/jobs", {
        customerId: users.customer.customerId,
        engine: "x",
        spec: { layout: "w16", cylinders: 0, balanceFactor: "120" },
      }),
      noParams,
    );
    expect(res.status).toBe(422);
    expect(Object.keys((await res.json()).error.fields).sort()).toEqual([
      "spec.balanceFactor",
      "spec.cylinders",
      "spec.layout",
    ]);
    expect(await countRows(db, "jobs")).toBe(jobs);
  });
});

describe("weigh-in", () => {
  it("works out the removal plan once every part has a weight", async () => {
    signInAs(users.machinist);
    await weigh(job.id, 1, "piston", ["400.0"]);
    let ws = await workshop(job.id);
    expect(ws.plan.complete).toBe(false);
    expect(ws.plan.missing).toContainEqual({ cylinder: 2, kind: "piston" });
    // Clearing a part removes its weight (and needs the version too).
    expect((await (await weigh(job.id, 1, "piston", [], 1)).json()).weight).toBeNull();

    await weighAll(job.id, FOUR);
    ws = await workshop(job.id);
    expect(ws.plan.complete).toBe(true);
    const piston2 = ws.plan.removal!.parts.find((p) => p.cylinder === 2 && p.kind === "piston")!;
    // 401.2 − 400.0 = 1.2 g over the lightest, outside the 0.5 g band: machine to 400.0 (common practice).
    expect(piston2).toMatchObject({ status: "remove", remove: "1.2", final: "400" });
    // Pistons are milled, not drilled: the plan says how much, and no drill depth (common practice).
    expect(ws.plan).not.toHaveProperty("drill");
    expect(ws.plan.progress["2:piston"]).toEqual({ state: "to-do", amount: "1.2" });
    // An in-line four is balanced without bobweights (common practice).
    expect(ws.plan.finished!.bobweightNeeded).toBe(false);
  });

  it("keeps repeated readings and audits every change", async () => {
    signInAs(users.machinist);
    const audit = await countRows(db, "audit_log");
    const res = await weigh(job.id, 1, "piston", ["400.0", "400.2"]);
    expect((await res.json()).weight).toMatchObject({ readings: ["400.0", "400.2"], version: 1 });
    expect(await countRows(db, "audit_log")).toBe(audit + 1);
  });

  it("answers a write based on an old version with 409 and the current version", async () => {
    signInAs(users.machinist);
    await weigh(job.id, 1, "piston", ["400.0"]);
    const stale = await weigh(job.id, 1, "piston", ["399.0"], 0);
    expect(stale.status).toBe(409);
    expect(await stale.json()).toMatchObject({ error: { code: "stale_write" }, currentVersion: 1 });
    const ws = await workshop(job.id);
    expect(ws.weights.find((w) => w.cylinder === 1 && w.kind === "piston")!.readings).toEqual([
      "400.0",
    ]);
  });

  it("refuses weights from the counter (403) and a cylinder the engine lacks (422)", async () => {
    signInAs(users.counter);
    expect((await weigh(job.id, 1, "piston", ["400"])).status).toBe(403);
    signInAs(users.machinist);
    const res = await weigh(job.id, 5, "piston", ["400"]);
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("cylinder");
  });

  it("refuses a weight that is not a plain number, naming the reading", async () => {
    signInAs(users.machinist);
    for (const bad of ["-1", "1e3", "abc", "NaN", "12.3.4", ""]) {
      const res = await weigh(job.id, 1, "piston", [bad]);
      expect(res.status, bad).toBe(422);
      expect((await res.json()).error.fields).toHaveProperty("readings.0");
    }
    expect(await countRows(db, "jobs")).toBe(1);
  });

  it("keeps the bench record from customers, their own job's too (they read the job's page)", async () => {
    const other = await addTestCustomer(db, "Noor Haddad");
    signInAs(users.owner);
    const res = await postJob(
      jsonRequest("POST", "/api/jobs", {
        customerId: other.id,
        engine: "x",
        spec: { layout: "single", cylinders: 1 },
      }),
      noParams,
    );
    const otherJob = (await res.json()).job as Job;
    signInAs(users.customer);
    expect(
      (await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(job.id) }))).status,
    ).toBe(403);
    expect(
      (await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(otherJob.id) }))).status,
    ).toBe(403);
    expect((await weigh(job.id, 1, "piston", ["1"])).status).toBe(403);
  });
});

describe("targets, re-weighing and pairing", () => {
  it("flags a part lighter than a set target for replacement", async () => {
    await weighAll(job.id, FOUR);
    const res = await putTarget(
      jsonRequest("PUT", "/x", { kind: "piston", target: "400.5", version: 0 }),
      params({ id: String(job.id) }),
    );
    const { plan } = await res.json();
    expect(
      plan.removal.parts.find(
        (p: { cylinder: number; kind: string }) => p.cylinder === 1 && p.kind === "piston",
      ).status,
    ).toBe("light");
  });

  it("takes bobweights from the re-weighed parts where they have been re-weighed", async () => {
    const v8 = await book({ layout: "v8-cross-plane", cylinders: 8 });
    const set = Object.fromEntries(Object.entries(FOUR).map(([k, v]) => [k, [...v, ...v]]));
    await weighAll(v8.id, set);
    const before = (await workshop(v8.id)).plan.finished!.bobweights[0]!.mass;
    // Cylinder 1's piston came back from machining 0.4 g heavier than planned.
    await weigh(v8.id, 1, "piston", ["400.4"], 0, "final");
    const after = (await workshop(v8.id)).plan.finished!.bobweights[0]!;
    expect(after.cylinders).toContain(1);
    // 50 % of the reciprocating mass counts: 0.4 g more piston → 0.2 g more bobweight (common practice).
    expect(Number(after.mass) - Number(before)).toBeCloseTo(0.2, 9);
  });

  it("applies a pairing by moving piston assemblies between rods", async () => {
    await weighAll(job.id, FOUR);
    const res = await applyPairing(
      jsonRequest("POST", "/x", {
        assignment: [
          { rodCylinder: 1, pistonFromCylinder: 2 },
          { rodCylinder: 2, pistonFromCylinder: 1 },
          { rodCylinder: 3, pistonFromCylinder: 3 },
          { rodCylinder: 4, pistonFromCylinder: 4 },
        ],
      }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(200);
    const ws: Workshop = await res.json();
    const at = (c: number, k: string) =>
      ws.weights.find((w) => w.cylinder === c && w.kind === k)!.readings[0];
    expect([at(1, "piston"), at(2, "piston"), at(1, "smallEnd")]).toEqual([
      "401.2",
      "400.0",
      "150.0",
    ]);
  });
});

describe("job settings and rotating parts", () => {
  it("keeps balancing settings to the machinist: the counter gets 403 naming the field", async () => {
    signInAs(users.counter);
    let res = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, spec: { tolerance: "1" } }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(403);
    res = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, spec: { promisedDate: "2026-12-24" } }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).job.spec.promisedDate).toBe("2026-12-24");
  });

  it("records the crank on the balancer and checks it against its grade", async () => {
    signInAs(users.machinist);
    const data = {
      massKg: "25",
      rpm: 6000,
      grade: "G 6.3",
      radiusMm: "50",
      before: { A: { mass: "12", angle: "40" }, B: { mass: "9", angle: "200" } },
      after: { A: { mass: "0.5" }, B: { mass: "0.4" } },
      corrections: [{ plane: "A", method: "drilled", where: "rear counterweight", mass: "11.5" }],
    };
    const res = await putRotating(
      jsonRequest("PUT", "/x", { data, version: 0 }),
      params({ id: String(job.id), part: "crankshaft" }),
    );
    expect(res.status).toBe(200);
    const rec = (await workshop(job.id)).rotating.find((r) => r.part === "crankshaft")!;
    // ISO 21940-11: U_per = 9549.3 × 6.3 × 25 / 6000 ≈ 250.7 g·mm, half per plane ≈ 125.3 g·mm.
    expect(Number(rec.check.permissible!.uPer)).toBeCloseTo(250.67, 1);
    expect(rec.check.before!.pass).toBe(false);
    expect(rec.check.after!.pass).toBe(true);
    expect(
      (
        await putRotating(
          jsonRequest("PUT", "/x", { data, version: 0 }),
          params({ id: String(job.id), part: "crankshaft" }),
        )
      ).status,
    ).toBe(409);
    expect(
      (
        await putRotating(
          jsonRequest("PUT", "/x", { data, version: 1 }),
          params({ id: String(job.id), part: "camshaft" }),
        )
      ).status,
    ).toBe(404);
  });
});

describe("settings that do not fit together", () => {
  it("refuses a cylinder count a preset layout does not have, at booking and later (422 on spec.cylinders)", async () => {
    signInAs(users.counter);
    const res = await postJob(
      jsonRequest("POST", "/api/jobs", {
        customerId: users.customer.customerId,
        engine: "x",
        spec: { layout: "v8-cross-plane", cylinders: 6 },
      }),
      noParams,
    );
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toHaveProperty("spec.cylinders");
    signInAs(users.machinist);
    const patch = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, spec: { cylinders: 6 } }),
      params({ id: String(job.id) }),
    );
    expect(patch.status).toBe(422);
  });
});
