import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { Workshop } from "@/lib/workshop/load";
import type { WorkshopPlan } from "@/lib/workshop/plan";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { bookFourMatchedByCylinder } from "./support/four-by-cylinder";

let db: DB;
let users: Record<Role, User>;
let job: Job;

// A made-up in-line four, grams (the same set as tests/lib/workshop/plan.test.ts, where the
// removal is worked by hand: 5.5 g taken off with the pistons as numbered, 2.3 g re-paired).
const FOUR: Record<string, string[]> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

const id = () => params({ id: String(job.id) });
const put = (body: Record<string, unknown>) =>
  putWeight(jsonRequest("PUT", "/x", { phase: "initial", ...body }), id());

async function workshop(): Promise<Workshop> {
  const res = await getWorkshop(jsonRequest("GET", "/x"), id());
  expect(res.status).toBe(200);
  return res.json();
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await bookFourMatchedByCylinder(users);
  // Everything but cylinder 4's big end: the last save completes the set.
  for (const [kind, values] of Object.entries(FOUR))
    for (const [i, v] of values.entries()) {
      if (kind === "bigEnd" && i === 3) continue;
      const res = await put({ cylinder: i + 1, kind: kind as PartKind, readings: [v], version: 0 });
      expect(res.status).toBe(200);
    }
  void db;
});

describe("the answer to one weight saved", () => {
  it("is the saved weight and the plan without the pairing search; the pairing comes with the full plan", async () => {
    const res = await put({ cylinder: 4, kind: "bigEnd", readings: ["400.1"], version: 0 });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { weight: { version: number }; plan: WorkshopPlan };
    expect(Object.keys(body).sort()).toEqual(["plan", "weight"]);
    expect(body.weight).toMatchObject({ cylinder: 4, kind: "bigEnd", readings: ["400.1"] });
    expect(body.weight.version).toBe(1);
    expect(body.plan.complete).toBe(true);
    expect(body.plan.pairing).toBeNull();
    expect(body.plan.pairingDeferred).toBe(true);

    // Asked for on its own, the plan has the pairing with its hand-worked saving.
    const full = await workshop();
    expect(full.plan.pairing).toMatchObject({ removedNumbered: "5.5", removedSuggested: "2.3" });
    expect(full.plan.pairingDeferred).toBeUndefined();
  });

  it("carries the same removal plan the machinist follows on the plan page", async () => {
    const res = await put({ cylinder: 4, kind: "bigEnd", readings: ["400.1"], version: 0 });
    const { plan } = (await res.json()) as { plan: WorkshopPlan };
    const full = await workshop();
    // 5.5 g in all, worked by hand in tests/lib/workshop/plan.test.ts.
    expect(plan.totalRemoved).toBe("5.5");
    expect(plan.removal).toEqual(full.plan.removal);
    expect(plan.finished).toEqual(full.plan.finished);
    expect(plan.progress).toEqual(full.plan.progress);
    expect(plan.missing).toEqual([]);
  });

  it("still refuses a stale version with 409 and leaves the part as it was", async () => {
    const first = await put({ cylinder: 4, kind: "bigEnd", readings: ["400.1"], version: 0 });
    expect(first.status).toBe(200);
    const stale = await put({ cylinder: 4, kind: "bigEnd", readings: ["400.6"], version: 0 });
    expect(stale.status).toBe(409);
    const ws = await workshop();
    expect(ws.weights.find((w) => w.cylinder === 4 && w.kind === "bigEnd")?.readings).toEqual([
      "400.1",
    ]);
  });
});
