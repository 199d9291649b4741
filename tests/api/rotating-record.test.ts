import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putRotating } from "@/app/api/jobs/[id]/rotating/[part]/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { Workshop } from "@/lib/workshop/load";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createJob(
    db,
    { customerId: users.customer.customerId!, engine: "Invented engine", spec: { maxRpm: 6000 } },
    null,
  );
  signInAs(users.machinist);
});

function save(part: string, data: unknown, version = 0) {
  return putRotating(
    jsonRequest("PUT", "/x", { data, version }),
    params({ id: String(job.id), part }),
  );
}

async function refusal(part: string, data: unknown) {
  const res = await save(part, data);
  expect(res.status).toBe(422);
  return ((await res.json()) as { error: { fields: Record<string, string> } }).error.fields;
}

const BASE = { massKg: "12", rpm: 6000, grade: "6.3", radiusMm: "150" };

describe("PUT /api/jobs/:id/rotating/:part refuses by field", () => {
  it("names the grams of a correction row left empty", async () => {
    const fields = await refusal("crankshaft", {
      ...BASE,
      corrections: [
        { plane: "A", method: "drilled", where: "front counterweight", mass: "6.2" },
        { plane: "B", method: "heavy-metal", where: "rear counterweight", mass: "" },
      ],
    });
    expect(Object.keys(fields)).toEqual(["data.corrections.1.mass"]);
    expect(fields["data.corrections.1.mass"]).toMatch(/grams/i);
  });

  it("refuses a correction of zero grams", async () => {
    const fields = await refusal("crankshaft", {
      ...BASE,
      corrections: [{ plane: "A", method: "drilled", where: "", mass: "0" }],
    });
    expect(Object.keys(fields)).toEqual(["data.corrections.0.mass"]);
  });

  it("refuses an angle of 400° on a reading and on a correction, and takes 0 and 360", async () => {
    const fields = await refusal("flywheel", {
      ...BASE,
      before: { A: { mass: "3.2", angle: "400" } },
      corrections: [{ plane: "A", method: "drilled", where: "", mass: "3", angle: "400" }],
    });
    expect(Object.keys(fields).sort()).toEqual(["data.before.A.angle", "data.corrections.0.angle"]);
    expect(fields["data.before.A.angle"]).toMatch(/0 to 360/);
    const ok = await save("flywheel", {
      ...BASE,
      before: { A: { mass: "3.2", angle: "360" } },
      after: { A: { mass: "0.2", angle: "0" } },
    });
    expect(ok.status).toBe(200);
  });

  it("asks for the grams when only an angle was typed", async () => {
    const fields = await refusal("flywheel", { ...BASE, after: { A: { mass: "", angle: "90" } } });
    expect(Object.keys(fields)).toEqual(["data.after.A.mass"]);
  });
});

describe("a flywheel balanced in one plane", () => {
  it("gets its verdict from the plane A readings: the whole U_per in that plane (ISO 21940-11)", async () => {
    const res = await save("flywheel", {
      ...BASE,
      before: { A: { mass: "4.5", angle: "100" } },
      after: { A: { mass: "0.15", angle: "300" } },
    });
    expect(res.status).toBe(200);
    const workshop = (await (
      await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(job.id) }))
    ).json()) as Workshop;
    const check = workshop.rotating.find((r) => r.part === "flywheel")!.check;
    // U_per = 9549.3 × 6.3 × 12 / 6000 = 120.32 g·mm (ISO 21940-11:2016); at 150 mm: 0.802 g.
    expect(check.planes).toBe("one");
    expect(Number(check.allowances[0]!.uPer)).toBeCloseTo(120.32, 2);
    expect(Number(check.allowances[0]!.massAtRadius)).toBeCloseTo(0.8021, 4);
    // After: 0.15 g × 150 mm = 22.5 g·mm ≤ 120.3: within. Before: 4.5 × 150 = 675 g·mm: over.
    expect(check.after).toMatchObject({ pass: true, planes: [{ residual: "22.5" }] });
    expect(check.before!.pass).toBe(false);
  });
});

describe("a record typed in ounces, pounds and inches", () => {
  // An invented flexplate: 26.5 lb, read at 5 in. By hand (NIST SP 811 App. B.8, exact):
  // 26.5 lb × 0.45359237 = 12.020197805 kg; 5 in × 25.4 = 127 mm; 0.25 oz × 28.349523125 =
  // 7.08738078125 g.
  const IN_OUNCES = {
    massUnit: "oz",
    lengthUnit: "in",
    rotorMass: "26.5",
    rpm: 6000,
    grade: "6.3",
    radius: "5.000",
    before: { A: { mass: "0.250", angle: "100" } },
    after: { A: { mass: "0.010", angle: "300" } },
    corrections: [
      { plane: "A", method: "drilled", where: "outer rim", mass: "0.24", angle: "280" },
    ],
  };

  async function workshop() {
    return (await (
      await getWorkshop(jsonRequest("GET", "/x"), params({ id: String(job.id) }))
    ).json()) as Workshop;
  }

  it("keeps every figure as typed with its units, and checks it in g, mm and kg", async () => {
    const res = await save("flywheel", IN_OUNCES);
    expect(res.status).toBe(200);
    const record = (await workshop()).rotating.find((r) => r.part === "flywheel")!;
    // Shown again as typed: no converted strings stored in their place.
    expect(record.data).toMatchObject(IN_OUNCES);
    const check = record.check;
    expect(check.units).toEqual({ mass: "oz", length: "in" });
    expect(check.radiusMm).toBe("127");
    // U_per = 9549.3 × 6.3 × 12.020197805 / 6000 = 120.52 g·mm (ISO 21940-11:2016); at 127 mm: 0.94899 g.
    expect(Number(check.allowances[0]!.uPer)).toBeCloseTo(120.52, 1);
    expect(Number(check.allowances[0]!.massAtRadius)).toBeCloseTo(0.949, 3);
    // After: 0.010 oz = 0.28349523125 g × 127 mm = 36.00389436875 g·mm: within.
    expect(check.after).toMatchObject({ pass: true, planes: [{ residual: "36.00389436875" }] });
    // Before: 0.25 oz = 7.08738078125 g × 127 mm = 900.09735921875 g·mm: over.
    expect(check.before).toMatchObject({ pass: false, planes: [{ residual: "900.09735921875" }] });
  });

  it("gives the same verdict as the same flexplate typed in g, kg and mm", async () => {
    await save("flywheel", IN_OUNCES);
    // 0.010 oz is 0.28349523125 g: more decimals than a typed figure may have, so the gram
    // record carries the nearest figure a scale could show at 0.001 g resolution (0.283 g).
    await save("clutch", {
      rotorMass: "12.020197805",
      rpm: 6000,
      grade: "6.3",
      radius: "127",
      after: { A: { mass: "0.283" } },
      before: { A: { mass: "7.087" } },
    });
    const rotating = (await workshop()).rotating;
    const oz = rotating.find((r) => r.part === "flywheel")!.check;
    const g = rotating.find((r) => r.part === "clutch")!.check;
    expect(g.units).toEqual({ mass: "g", length: "mm" });
    expect(oz.allowances).toEqual(g.allowances);
    expect(oz.after!.pass).toBe(g.after!.pass);
    expect(oz.before!.pass).toBe(g.before!.pass);
  });

  it("refuses by field, naming ounces, an unknown unit and a figure given twice", async () => {
    const fields = await refusal("flywheel", {
      ...IN_OUNCES,
      lengthUnit: "ft",
      after: { A: { mass: "", angle: "90" } },
      corrections: [{ plane: "A", method: "drilled", where: "", mass: "" }],
    });
    expect(Object.keys(fields).sort()).toEqual([
      "data.after.A.mass",
      "data.corrections.0.mass",
      "data.lengthUnit",
    ]);
    expect(fields["data.after.A.mass"]).toMatch(/ounces the balancer reads/);
    expect(fields["data.corrections.0.mass"]).toMatch(/ounces of this correction/);
    expect(fields["data.lengthUnit"]).toMatch(/mm or inches/);
    // The rotor's mass sent as typed and under its older kg name: which one is meant?
    const twice = await refusal("flywheel", { ...IN_OUNCES, massKg: "12" });
    expect(twice).toEqual({ "data.rotorMass": expect.stringMatching(/Rotor mass: give it once/) });
  });

  it("reads a record saved before units were kept as grams and mm", async () => {
    await save("flywheel", {
      ...BASE,
      before: { A: { mass: "4.5" } },
      after: { A: { mass: "0.15" } },
    });
    const check = (await workshop()).rotating.find((r) => r.part === "flywheel")!.check;
    expect(check.units).toEqual({ mass: "g", length: "mm" });
    // 0.15 g × 150 mm = 22.5 g·mm, as before units were kept.
    expect(check.after).toMatchObject({ pass: true, planes: [{ residual: "22.5" }] });
  });
});
