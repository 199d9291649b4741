import { sql } from "kysely";
import { beforeEach, describe, expect, it } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import { POST as postJob } from "@/app/api/jobs/route";
import { GET as getSettings, PUT as putSettings } from "@/app/api/settings/route";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { Workshop } from "@/lib/workshop/load";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

async function book(spec: Record<string, unknown>): Promise<Job> {
  signInAs(users.counter);
  const res = await postJob(
    jsonRequest("POST", "/api/jobs", { customerId: users.customer.customerId, engine: "V8", spec }),
    noParams,
  );
  expect(res.status).toBe(201);
  return (await res.json()).job;
}

const settingsBody = (version: number, changes: Record<string, unknown> = {}) => ({
  version,
  shopName: "Test Balancing",
  taxRate: "0",
  currency: "USD",
  maxUploadMb: "10",
  ...changes,
});

// A made-up cross-plane V8, all eight cylinders alike (g): piston 500.0, wrist pin 120.0,
// small end 160.0, big end 440.0. Reciprocating 780.0, rotating 440.0 per rod.
const V8_PART: Record<string, string> = {
  piston: "500.0",
  wristPin: "120.0",
  smallEnd: "160.0",
  bigEnd: "440.0",
};

async function weighV8(jobId: number) {
  signInAs(users.machinist);
  for (const [kind, value] of Object.entries(V8_PART)) {
    for (let cylinder = 1; cylinder <= 8; cylinder++) {
      const res = await putWeight(
        jsonRequest("PUT", "/x", {
          cylinder,
          kind: kind as PartKind,
          phase: "initial",
          readings: [value],
          version: 0,
        }),
        params({ id: String(jobId) }),
      );
      expect(res.status).toBe(200);
    }
  }
}

async function workshop(jobId: number): Promise<Workshop> {
  const res = await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(jobId) }));
  expect(res.status).toBe(200);
  return res.json();
}

describe("the shop's oil allowance per rod", () => {
  it("starts a fresh shop at 2 g per rod, within the 2–5 g per rod of common practice", async () => {
    signInAs(users.machinist);
    const res = await getSettings(jsonRequest("GET", "/api/settings"), noParams);
    const { settings } = await res.json();
    expect(Number(settings.oilAllowancePerRodG)).toBeGreaterThanOrEqual(2);
    expect(Number(settings.oilAllowancePerRodG)).toBeLessThanOrEqual(5);
  });

  it("is what a new job starts with, and the bobweight takes it once per rod", async () => {
    signInAs(users.owner);
    const saved = await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(0, { oilAllowancePerRodG: "2.5" })),
      noParams,
    );
    expect(saved.status).toBe(200);
    expect((await saved.json()).settings.oilAllowancePerRodG).toBe("2.5");

    const job = await book({ layout: "v8-cross-plane", cylinders: 8 });
    expect(job.spec.oilAllowancePerRod).toBe("2.5");
    await weighV8(job.id);
    const finished = (await workshop(job.id)).plan.finished!;
    // Each pin, 50 %: 2 × 440.0 + 2 × 2.5 + 0.5 × 2 × 780.0 = 880 + 5 + 780 = 1665 (common practice,
    // worked by hand: 2 × rotating + 1 × reciprocating + 2 × oil per rod).
    expect(finished.bobweights.map((b) => [b.mass, b.oil])).toEqual(
      Array.from({ length: 4 }, () => ["1665", "5"]),
    );
    expect(finished.oilAllowancePerRod).toBe("2.5");
    expect(finished.buildTo).toEqual([
      expect.objectContaining({ mass: "1665", spread: "0", spreadAboveResolution: false }),
    ]);
  });

  it("is converted for a job weighed in ounces: 2 g = 0.0705 oz → 0.071 oz (1 oz = 28.349523125 g, NIST SP 811)", async () => {
    const job = await book({ layout: "v8-cross-plane", cylinders: 8, massUnit: "oz" });
    // 2 ÷ 28.349523125 = 0.070548… oz, kept to two significant figures as a shop setting.
    expect(job.spec.oilAllowancePerRod).toBe("0.071");
  });

  it("does not change a job already booked, nor one booked with a per-rod figure of its own", async () => {
    const before = await book({ layout: "v8-cross-plane", cylinders: 8 });
    const own = await book({ layout: "v8-cross-plane", cylinders: 8, oilAllowancePerRod: "4" });
    signInAs(users.owner);
    await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(0, { oilAllowancePerRodG: "3" })),
      noParams,
    );
    const after = await book({ layout: "v8-cross-plane", cylinders: 8 });
    expect([before, own, after].map((j) => j.spec.oilAllowancePerRod)).toEqual(["2", "4", "3"]);
  });

  it("keeps the saved figure when a caller that predates it saves the settings, and refuses a bad one naming the field", async () => {
    signInAs(users.owner);
    await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(0, { oilAllowancePerRodG: "3" })),
      noParams,
    );
    const res = await putSettings(jsonRequest("PUT", "/api/settings", settingsBody(1)), noParams);
    expect((await res.json()).settings.oilAllowancePerRodG).toBe("3");
    const bad = await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(2, { oilAllowancePerRodG: "-1" })),
      noParams,
    );
    expect(bad.status).toBe(422);
    expect((await bad.json()).error.fields).toHaveProperty("oilAllowancePerRodG");
    signInAs(users.machinist);
    const refused = await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(2, { oilAllowancePerRodG: "5" })),
      noParams,
    );
    expect(refused.status).toBe(403);
  });
});

describe("a job's oil allowance", () => {
  it("keeps a job booked per crankpin on that figure: its bobweights do not change", async () => {
    // As jobs were stored before the per-rod setting: 4 per crankpin, no per-rod figure.
    const job = await createJob(
      db,
      {
        customerId: users.customer.customerId!,
        engine: "V8",
        spec: { layout: "v8-cross-plane", cylinders: 8, oilAllowance: "4" },
      },
      null,
    );
    const row = await sql<{ per_rod: string | null }>`
      select oil_allowance_per_rod as per_rod from jobs where id = ${job.id}
    `.execute(db);
    expect(row.rows[0]?.per_rod).toBeNull();
    await weighV8(job.id);
    const finished = (await workshop(job.id)).plan.finished!;
    // 880 + 4 + 780 = 1664: the pin's 4, not 4 per rod.
    expect(finished.bobweights.map((b) => [b.mass, b.oil])[0]).toEqual(["1664", "4"]);
    expect(finished.oilAllowancePerRod).toBeNull();
  });

  it("moves to per rod when the machinist gives a per-rod figure", async () => {
    const job = await book({ layout: "v8-cross-plane", cylinders: 8, oilAllowance: "4" });
    expect(job.spec).toMatchObject({ oilAllowance: "4", oilAllowancePerRod: null });
    signInAs(users.machinist);
    const res = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, spec: { oilAllowancePerRod: "3" } }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).job.spec).toMatchObject({
      oilAllowance: "0",
      oilAllowancePerRod: "3",
    });
  });
});
