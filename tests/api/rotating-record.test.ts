import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putRotating } from "@/app/api/jobs/[id]/rotating/[part]/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import type { DB } from "@/db/client";
import { createJob, type Job } from "@/db/jobs";
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
    // U_per = 9549.3 × 6.3 × 12 / 6000 = 120.32 g·mm (DOMAIN §5); at 150 mm: 0.802 g.
    expect(check.planes).toBe("one");
    expect(Number(check.allowances[0]!.uPer)).toBeCloseTo(120.32, 2);
    expect(Number(check.allowances[0]!.massAtRadius)).toBeCloseTo(0.8021, 4);
    // After: 0.15 g × 150 mm = 22.5 g·mm ≤ 120.3: within. Before: 4.5 × 150 = 675 g·mm: over.
    expect(check.after).toMatchObject({ pass: true, planes: [{ residual: "22.5" }] });
    expect(check.before!.pass).toBe(false);
  });
});
