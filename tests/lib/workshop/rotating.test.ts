import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { RotatingPart } from "@/db/schema";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { buildCardData } from "@/lib/cards/card-data";
import type { RotatingRecordInput } from "@/lib/validation/workshop";
import { loadWorkshop } from "@/lib/workshop/load";
import { checkRotatingRecord, planesOf } from "@/lib/workshop/rotating";
import { createFourCylinderJob } from "../../api/cards/fixtures";
import { addOneOfEachRole, freshDb } from "../../helpers/db";

const record = (part: RotatingPart, data: RotatingRecordInput) => ({
  part,
  data,
  version: 1,
  updatedAt: "2026-12-02T00:00:00.000Z",
});

// An invented flexplate: 10 kg, 3000 rpm, G 6.3, read at 100 mm.
const FLEXPLATE: RotatingRecordInput = {
  massKg: "10",
  rpm: 3000,
  grade: "6.3",
  radiusMm: "100",
  before: { A: { mass: "12", angle: "40" } },
  after: { A: { mass: "1.9", angle: "220" } },
};

describe("single-plane records (flexplate, flywheel, clutch cover, damper)", () => {
  it("allows the whole U_per in the one plane (ISO 21940-11)", () => {
    const check = checkRotatingRecord(record("flywheel", FLEXPLATE));
    expect(check.planes).toBe("one");
    // ISO 21940-11 check value: G 6.3 at 3000 rpm, Ω = 2π·3000/60 = 314.159 rad/s,
    // e_per = 6.3 / 314.159 × 1000 = 20.05 g·mm/kg.
    expect(Number(check.permissible!.ePer)).toBeCloseTo(20.05, 2);
    // U_per = 9549.3 × G × m / n = 9549.3 × 6.3 × 10 / 3000 = 200.535 g·mm (ISO 21940-11:2016), all in one plane.
    expect(check.allowances).toHaveLength(1);
    expect(Number(check.allowances[0]!.uPer)).toBeCloseTo(200.535, 2);
    // As grams at the balancer radius: 200.535 / 100 = 2.005 g.
    expect(Number(check.allowances[0]!.massAtRadius)).toBeCloseTo(2.00535, 4);
  });

  it("gives a verdict from the plane A readings alone", () => {
    const check = checkRotatingRecord(record("flywheel", FLEXPLATE));
    // Before: 12 g × 100 mm = 1200 g·mm > 200.5: over. After: 1.9 × 100 = 190 g·mm ≤ 200.5: within.
    expect(check.before).toMatchObject({ pass: false, planes: [{ plane: "A", residual: "1200" }] });
    expect(check.after).toMatchObject({ pass: true, planes: [{ plane: "A", residual: "190" }] });
  });

  it("is stricter in two planes: the same 1.9 g fails against half of U_per", () => {
    // Two planes, half each (handbook simplification): 100.27 g·mm per plane; 190 g·mm is over.
    const check = checkRotatingRecord(
      record("flywheel", {
        ...FLEXPLATE,
        planes: "two",
        after: { A: { mass: "1.9" }, B: { mass: "0.2" } },
      }),
    );
    expect(check.allowances.map((a) => Number(a.uPer))).toEqual([
      expect.closeTo(100.27, 2),
      expect.closeTo(100.27, 2),
    ]);
    expect(check.after!.pass).toBe(false);
  });

  it("fails a reading past the allowance: 2.1 g at 100 mm is 210 g·mm > 200.5", () => {
    const check = checkRotatingRecord(
      record("damper", { ...FLEXPLATE, after: { A: { mass: "2.1" } } }),
    );
    expect(check.after!.pass).toBe(false);
  });
});

describe("how many planes a record is balanced in", () => {
  it("takes the machinist's choice, else two for a crank and one for the others", () => {
    expect(planesOf("crankshaft", {})).toBe("two");
    expect(planesOf("flywheel", {})).toBe("one");
    expect(planesOf("crankshaft", { planes: "one" })).toBe("one");
    expect(planesOf("clutch", { planes: "two" })).toBe("two");
  });

  it("keeps two planes for a flywheel saved with a plane B reading", () => {
    expect(planesOf("flywheel", { after: { A: { mass: "1" }, B: { mass: "1" } } })).toBe("two");
  });

  it("keeps a two-plane crank without a verdict until both planes are read", () => {
    const check = checkRotatingRecord(
      record("crankshaft", { ...FLEXPLATE, after: { A: { mass: "0.4" } } }),
    );
    expect(check.planes).toBe("two");
    expect(check.after).toBeNull();
  });
});

describe("the balance card prints the single-plane verdict", () => {
  let db: DB;
  beforeEach(async () => {
    db = await freshDb();
  });

  it("says within the grade for a flexplate read in one plane, not 'final reading not recorded'", async () => {
    const users = await addOneOfEachRole(db);
    const job = await createFourCylinderJob(db, users.customer.customerId!);
    await saveRotatingRecord(
      db,
      { jobId: job.id, part: "flywheel", data: FLEXPLATE, baseVersion: 0 },
      null,
    );
    const workshop = await loadWorkshop(db, job);
    const card = buildCardData({
      workshop,
      customer: { name: "Invented customer", company: null },
      settings: { shopName: "Invented shop", address: null, phone: null, email: null },
      logoSha256: null,
      issuer: { id: users.machinist.id, name: users.machinist.name },
      revision: 1,
      code: "AAAAA-BBBBB",
      verifyUrl: "http://localhost/verify/AAAAABBBBB",
      pageSize: "A4",
      issuedAt: "2026-12-02T00:00:00.000Z",
    });
    const flexplate = card.rotating.find((r) => r.part === "flywheel")!;
    expect(flexplate.pass).toBe(true);
    expect(flexplate.planes).toHaveLength(1);
    expect(flexplate.planes[0]).toMatchObject({
      plane: "single",
      after: { residual: "190", mass: "1.9", pass: true },
    });
  });
});
