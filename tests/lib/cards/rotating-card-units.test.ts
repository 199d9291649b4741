import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { parseCardData } from "@/lib/cards/card-data";
import { issueCard } from "@/lib/cards/issue";
import { findCardFile } from "@/lib/cards/list";
import { findCardByCode } from "@/db/cards";
import type { RotatingRecordInput } from "@/lib/validation/workshop";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createFourCylinderJob, readPdf } from "../../api/cards/fixtures";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

/** The text a parser reads back, with line breaks and runs of spaces made single spaces. */
const flat = (text: string) => text.replace(/\s+/g, " ");

async function cardWith(data: RotatingRecordInput) {
  const job = await createFourCylinderJob(db, users.customer.customerId!);
  await saveRotatingRecord(db, { jobId: job.id, part: "crankshaft", data, baseVersion: 0 }, null);
  const card = await issueCard(db, job.id, users.machinist, {
    override: true,
    overrideReason: "Invented test",
  });
  const file = await findCardFile(db, job.id, card.revision, users.owner);
  const stored = await findCardByCode(db, card.verificationCode.replace("-", ""));
  return {
    text: flat((await readPdf(file.bytes)).text),
    data: parseCardData(stored!.dataJson).rotating.find((r) => r.part === "crankshaft")!,
  };
}

describe("the card's rotating section in the units the record was typed in", () => {
  // An invented crank: 50 lb, 6000 rpm, G 6.3, read at 3 in, two planes half each. By hand
  // (ISO 21940-11; NIST SP 811 App. B.8 factors): 50 lb = 22.6796185 kg, e_per = 6.3 / 628.3185
  // × 1000 = 10.0268 g·mm/kg, U_per = 227.40 g·mm = 227.40 / 720.0779 = 0.3158 oz·in, each plane
  // 0.1579 oz·in (0.16 to two figures), at 3 in 0.05263 oz (0.053). After: 0.05 oz × 3 in =
  // 0.15 oz·in, within; before 0.6 oz × 3 in = 1.8 oz·in.
  const crank: RotatingRecordInput = {
    massUnit: "oz",
    lengthUnit: "in",
    rotorMass: "50",
    rpm: 6000,
    grade: "6.3",
    radius: "3.00",
    planes: "two",
    before: { A: { mass: "0.6" }, B: { mass: "0.3" } },
    after: { A: { mass: "0.05" }, B: { mass: "0.02" } },
    corrections: [
      { plane: "A", method: "drilled", where: "front counterweight", mass: "0.55", angle: "95" },
      { plane: "B", method: "heavy-metal", where: "rear counterweight", mass: "0.28" },
    ],
  };

  it("prints ounces, pounds, inches and oz·in, the figures as typed, and the angles", async () => {
    const { text, data } = await cardWith(crank);
    expect(data.units).toEqual({ mass: "oz", length: "in" });
    expect(data.rotorMass).toBe("50");
    expect(data.massKg).toBe("22.6796185");
    expect(text).toContain("rotor 50 lb");
    expect(text).toContain("balancer radius 3.00 in");
    expect(text).toContain("PERMISSIBLE, oz·in (oz at radius)");
    expect(text).toMatch(/A 0\.16 \(0\.053 oz\) 1\.8 \(0\.6 oz\) 0\.15 \(0\.05 oz\) within/);
    expect(text).toContain("plane A, drilled 0.55 oz at 95° (front counterweight)");
    expect(text).toContain("plane B, heavy metal 0.28 oz (rear counterweight)");
    expect(text).toContain("WITHIN G 6.3");
    expect(text).not.toContain("g·mm");
  });

  it("prints a record saved in grams and mm as before, with its correction angles", async () => {
    const { text } = await cardWith({
      massKg: "24.5",
      rpm: 7000,
      grade: "6.3",
      radiusMm: "60",
      after: { A: { mass: "0.6" }, B: { mass: "0.5" } },
      corrections: [
        { plane: "A", method: "drilled", where: "front counterweight", mass: "13.6", angle: "35" },
      ],
    });
    expect(text).toContain("rotor 24.5 kg");
    expect(text).toContain("balancer radius 60 mm");
    expect(text).toContain("PERMISSIBLE, g·mm (g at radius)");
    expect(text).toContain("plane A, drilled 13.6 g at 35° (front counterweight)");
  });
});
