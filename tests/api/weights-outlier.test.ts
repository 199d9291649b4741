import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { PUT as putSettings } from "@/app/api/settings/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import { describeChange } from "@/components/jobs/change-sentences";
import { listJobChanges } from "@/db/audit";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import { listPartWeights } from "@/db/weights";
import { savePartWeight } from "@/lib/workshop/save-weight";
import type { Workshop } from "@/lib/workshop/load";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

// A made-up in-line four, grams, scale 0.1 g, tolerance 0.5 g (the defaults).
const FOUR: Record<string, string[]> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

function put(body: Record<string, unknown>) {
  return putWeight(
    jsonRequest("PUT", `/api/jobs/${job.id}/weights`, { phase: "initial", version: 0, ...body }),
    params({ id: String(job.id) }),
  );
}

async function workshop(): Promise<Workshop> {
  const res = await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(job.id) }));
  return res.json();
}

/** Straight through the db layer, as an older save or a CSV import leaves it (no check). */
async function plant(cylinder: number, kind: PartKind, value: string) {
  await savePartWeight(
    db,
    { jobId: job.id, cylinder, kind, phase: "initial", readings: [value], baseVersion: 0 },
    null,
  );
}

async function weighSet(set: Record<string, string[]>, skip: (c: number, k: string) => boolean) {
  for (const [kind, values] of Object.entries(set))
    for (const [i, v] of values.entries())
      if (!skip(i + 1, kind)) await plant(i + 1, kind as PartKind, v);
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createJob(
    db,
    {
      customerId: users.customer.customerId!,
      engine: "test four",
      spec: { layout: "inline-4", cylinders: 4 },
    },
    null,
  );
  signInAs(users.machinist);
});

describe("a weight of zero", () => {
  it("is refused with 422 naming the part in the machinist's words, and nothing is saved", async () => {
    for (const zero of ["0", "0.0", "000.00"]) {
      const res = await put({ cylinder: 3, kind: "piston", readings: [zero] });
      expect(res.status).toBe(422);
      const body = await res.json();
      expect(body.error.code).toBe("invalid_input");
      expect(body.error.fields.readings).toBe(
        "Cylinder 3 piston: a weight of zero is not a reading. Weigh the part again.",
      );
    }
    // Among repeated readings too.
    expect((await put({ cylinder: 3, kind: "piston", readings: ["400.1", "0"] })).status).toBe(422);
    expect(await listPartWeights(db, job.id)).toEqual([]);
  });
});

describe("a weight far from the rest of its kind", () => {
  beforeEach(async () => {
    await weighSet(FOUR, (c, k) => k === "piston" && c === 4);
  });

  it("is held: 422 'outlier' naming the part and the median, and nothing is saved", async () => {
    // "4009" typed for 400.9. Pistons 400.0, 401.2, 400.3 and 4009: sorted 400.0, 400.3, 401.2,
    // 4009 → median (400.3 + 401.2) / 2 = 400.75 (a computed mass: one decimal finer than the
    // 0.1 g scale). 4009 / 400.75 = 10.004 → "10×". 5 % is the default limit (common practice).
    const res = await put({ cylinder: 4, kind: "piston", readings: ["4009"] });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("outlier");
    expect(body.error.message).toBe(
      "Cylinder 4 piston: 4009 g is 10× the other pistons (median 400.75 g) — a missed decimal point? " +
        "Confirm it if that is what the scale read, or retype it.",
    );
    expect(body.error.fields.readings).toBe(body.error.message);
    const saved = await listPartWeights(db, job.id);
    expect(saved.find((w) => w.cylinder === 4 && w.kind === "piston")).toBeUndefined();
  });

  it("says how far in percent when it is not a slipped decimal point", async () => {
    // 430.0 against median of 400.0, 400.3, 401.2, 430.0 = (400.3 + 401.2) / 2 = 400.75:
    // (430 − 400.75) / 400.75 = 29.25 / 400.75 = 7.299 % → "7.3 % heavier".
    const res = await put({ cylinder: 4, kind: "piston", readings: ["430.0"] });
    expect(res.status).toBe(422);
    expect((await res.json()).error.message).toBe(
      "Cylinder 4 piston: 430.0 g is 7.3 % heavier than the other pistons (median 400.75 g). " +
        "Confirm it if that is what the scale read, or retype it.",
    );
  });

  it("is saved when confirmed, with the mark; a plausible weight saves without a question", async () => {
    const res = await put({
      cylinder: 4,
      kind: "piston",
      readings: ["430.0"],
      confirmOutlier: true,
    });
    expect(res.status).toBe(200);
    const { weight } = await res.json();
    expect(weight).toMatchObject({ readings: ["430.0"], confirmedOutlier: true, version: 1 });

    // Retyped to a plausible figure without the flag: saved, and the mark is gone.
    const retyped = await put({ cylinder: 4, kind: "piston", readings: ["400.9"], version: 1 });
    expect(retyped.status).toBe(200);
    expect((await retyped.json()).weight).toMatchObject({ confirmedOutlier: false, version: 2 });
  });

  it("asks again when a confirmed weight is changed to another outlying figure", async () => {
    await put({ cylinder: 4, kind: "piston", readings: ["430.0"], confirmOutlier: true });
    const res = await put({ cylinder: 4, kind: "piston", readings: ["4300"], version: 1 });
    expect(res.status).toBe(422);
    expect((await res.json()).error.code).toBe("outlier");
  });

  it("stores no mark when confirmOutlier comes with a weight that is not an outlier", async () => {
    const res = await put({
      cylinder: 4,
      kind: "piston",
      readings: ["400.9"],
      confirmOutlier: true,
    });
    expect(res.status).toBe(200);
    expect((await res.json()).weight.confirmedOutlier).toBe(false);
  });

  it("with two parts of a kind compares with the other one", async () => {
    // Retainers only on cylinders 1 and 2: 1.5 g, then "15" typed: 15 / 1.5 = 10×, and 13.5 g
    // is past the 0.5 g tolerance, so the percentage applies.
    await plant(1, "retainers", "1.5");
    const res = await put({ cylinder: 2, kind: "retainers", readings: ["15"] });
    expect(res.status).toBe(422);
    expect((await res.json()).error.message).toContain(
      "15 g is 10× the other pin retainers (1.5 g)",
    );
  });
});

describe("the plan waits for a held weight", () => {
  it("is not worked out while an outlier is unconfirmed, and names it; confirming releases it", async () => {
    // A full set where cylinder 2's piston reads 4012 (planted as an older save would leave it).
    await weighSet(FOUR, (c, k) => k === "piston" && c === 2);
    await plant(2, "piston", "4012");
    let plan = (await workshop()).plan;
    expect(plan.complete).toBe(false);
    expect(plan.removal).toBeNull();
    expect(plan.held).toHaveLength(1);
    expect(plan.held[0]).toMatchObject({ cylinder: 2, kind: "piston", confirmed: false });
    // Median of 400.0, 400.3, 400.9, 4012 = (400.3 + 400.9) / 2 = 400.6.
    expect(plan.error?.message).toContain("Cylinder 2 piston: 4012 g is 10× the other pistons");
    expect(plan.error?.message).toContain("median 400.60 g");

    // The machinist confirms the figure as read (same readings, confirmOutlier).
    const res = await put({
      cylinder: 2,
      kind: "piston",
      readings: ["4012"],
      version: 1,
      confirmOutlier: true,
    });
    expect(res.status).toBe(200);
    plan = (await res.json()).plan;
    expect(plan.held).toEqual([]);
    expect(plan.error).toBeNull();
    expect(plan.complete).toBe(true);
  });

  it("keeps the confirmation in the job's history, even when the readings are unchanged", async () => {
    await weighSet(FOUR, (c, k) => k === "piston" && c === 2);
    await plant(2, "piston", "4012");
    await put({
      cylinder: 2,
      kind: "piston",
      readings: ["4012"],
      version: 1,
      confirmOutlier: true,
    });
    const sentences = (await listJobChanges(db, job.id)).flatMap((c) => describeChange(c, "g"));
    expect(sentences).toContain(
      "Cylinder 2 piston 4012 g confirmed as read although far from the rest (first weigh)",
    );
  });

  it("is worked out once the outlier is retyped", async () => {
    await weighSet(FOUR, (c, k) => k === "piston" && c === 2);
    await plant(2, "piston", "4012");
    const res = await put({ cylinder: 2, kind: "piston", readings: ["401.2"], version: 1 });
    expect(res.status).toBe(200);
    const { plan } = await res.json();
    expect(plan.complete).toBe(true);
    // Hand-worked: lightest piston 400.0; 401.2 − 400.0 = 1.2 g to take off (over the 0.5 g band).
    const part = plan.removal.parts.find(
      (p: { cylinder: number; kind: string }) => p.cylinder === 2 && p.kind === "piston",
    );
    expect(part).toMatchObject({ remove: "1.2" });
  });
});

describe("the shop's own percentage", () => {
  const settingsBody = (outlierPercent: string) => ({
    version: 0,
    shopName: "Test shop",
    taxRate: "0",
    currency: "USD",
    maxUploadMb: "10",
    outlierPercent,
  });

  it("is what the weigh-in holds against", async () => {
    await weighSet(FOUR, (c, k) => k === "piston" && c === 4);
    signInAs(users.owner);
    const saved = await putSettings(jsonRequest("PUT", "/x", settingsBody("10")), noParams);
    expect(saved.status).toBe(200);
    expect((await saved.json()).settings.outlierPercent).toBe("10");
    signInAs(users.machinist);
    // 430.0 is 7.3 % above the median 400.75 (hand-worked above): held at 5 %, not at 10 %.
    const res = await put({ cylinder: 4, kind: "piston", readings: ["430.0"] });
    expect(res.status).toBe(200);
    // 441.0: (441 − 400.75) / 400.75 = 10.04 % > 10 %: held.
    const far = await put({ cylinder: 4, kind: "piston", readings: ["441.0"], version: 1 });
    expect((await far.json()).error.code).toBe("outlier");
  });

  it("is refused outside 1 to 50 %, naming the field", async () => {
    signInAs(users.owner);
    for (const bad of ["0", "60", "five"]) {
      const res = await putSettings(jsonRequest("PUT", "/x", settingsBody(bad)), noParams);
      expect(res.status).toBe(422);
      expect((await res.json()).error.fields).toHaveProperty("outlierPercent");
    }
  });
});
