import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { PartWeight } from "@/db/weights";
import { planToCsv, previewWeightsCsv, weightsToCsv } from "@/lib/workshop/csv";
import { buildWorkshopPlan } from "@/lib/workshop/plan";

const job = { id: 1, spec: { ...DEFAULT_SPEC, layout: "inline-4", cylinders: 4 } } as Job;
const saved: PartWeight[] = [
  {
    cylinder: 1,
    kind: "piston",
    phase: "initial",
    readings: ["400.0"],
    confirmedOutlier: false,
    version: 3,
    updatedAt: "",
  },
];

describe("reading weights from a CSV", () => {
  it("takes one row per reading, repeated rows as repeated readings, and names each bad row", () => {
    const csv = [
      "Cylinder,Part,Weight",
      "1,piston,400.0",
      "2,Piston,401.2",
      "2,piston,401.4",
      "3,wrist pin,100.1",
      "4,piston,4O1.0", // a letter O typed for a zero
      "5,piston,400.0",
      "1,crank,9000",
    ].join("\n");
    const p = previewWeightsCsv(csv, job, saved, "initial");
    expect(p.format).toBe("one row per reading");
    expect(p.unchanged).toBe(1);
    expect(p.changes).toEqual([
      {
        cylinder: 2,
        kind: "piston",
        phase: "initial",
        current: [],
        next: ["401.2", "401.4"],
        version: 0,
      },
      { cylinder: 3, kind: "wristPin", phase: "initial", current: [], next: ["100.1"], version: 0 },
    ]);
    expect(p.errors).toEqual([
      { line: 6, message: '"4O1.0" is not a weight: use digits and one point, like 498.6.' },
      { line: 7, message: 'Cylinder "5" is not one of 1 to 4.' },
      { line: 8, message: '"crank" is not a part we weigh.' },
    ]);
  });

  it("takes one row per cylinder with a column per part, and the phase per row", () => {
    const csv = "cyl;piston;small end;big end;phase\n1;399.5;150.0;400.1;final\n2;401.0;;400.3;\n";
    const p = previewWeightsCsv(csv, job, saved, "initial");
    expect(p.format).toBe("one row per cylinder");
    expect(p.errors).toEqual([]);
    expect(
      p.changes.map((c) => `${c.cylinder}:${c.kind}:${c.phase}=${c.next.join(" ")}`).sort(),
    ).toEqual([
      "1:bigEnd:final=400.1",
      "1:piston:final=399.5",
      "1:smallEnd:final=150.0",
      "2:bigEnd:initial=400.3",
      "2:piston:initial=401.0",
    ]);
  });

  it("refuses a file without a cylinder column", () => {
    expect(previewWeightsCsv("part,weight\npiston,1\n", job, [], "initial").errors[0]).toEqual({
      line: 1,
      message: 'The heading row needs a "cylinder" column.',
    });
  });

  it("writes the weigh-in back in a form it reads again (round trip through papaparse)", () => {
    const weights: PartWeight[] = [
      {
        cylinder: 2,
        kind: "smallEnd",
        phase: "final",
        readings: ["150.2", "150.3"],
        confirmedOutlier: false,
        version: 1,
        updatedAt: "",
      },
    ];
    const csv = weightsToCsv(weights);
    expect(Papa.parse(csv, { header: true }).data).toEqual([
      { cylinder: "2", part: "small end", phase: "final", weight: "150.2" },
      { cylinder: "2", part: "small end", phase: "final", weight: "150.3" },
    ]);
    expect(previewWeightsCsv(csv, job, weights, "initial")).toMatchObject({
      changes: [],
      unchanged: 1,
      errors: [],
    });
  });
});

describe("the removal plan as CSV", () => {
  it("writes figures by the display rule: readings at the scale, means and worked-out masses one decimal finer", () => {
    const four = {
      piston: ["400.0", ["401.1", "401.2", "401.2"], "400.3", "400.2"],
      wristPin: ["100.0", "100.1", "100.0", "100.2"],
      smallEnd: ["150.0", "150.4", "150.3", "150.2"],
      bigEnd: ["400.0", "400.2", "400.4", "400.1"],
    } as const;
    const weights: PartWeight[] = Object.entries(four).flatMap(([kind, values]) =>
      values.map((v, i) => ({
        cylinder: i + 1,
        kind: kind as PartWeight["kind"],
        phase: "initial" as const,
        readings: typeof v === "string" ? [v] : [...v],
        confirmedOutlier: false,
        version: 1,
        updatedAt: "",
      })),
    );
    const rows = Papa.parse<Record<string, string>>(
      planToCsv(buildWorkshopPlan(job, weights, []), job),
      { header: true },
    ).data;
    const piston = (c: number) => rows.find((r) => r.part === "piston" && r.cylinder === String(c));
    // The lightest piston, one reading: at the 0.1 g resolution, left as weighed.
    expect(piston(1)).toMatchObject({ weighed: "400.0", finished: "400.0", state: "in band" });
    // Nothing to take off is written to the same digits as a figure to take off.
    expect(piston(1)).toMatchObject({ remove: "0.00" });
    // Three readings: 1203.5 / 3 = 401.1666… g (by hand), 1.1666… g over the 400.0 g target,
    // outside the 0.5 g band: machined to the target (common practice).
    expect(piston(2)).toMatchObject({
      weighed: "401.17",
      target: "400.00",
      finished: "400.00",
      state: "take off",
      unit: "g",
    });
    expect(Object.values(piston(2)!).join(" ")).toContain("1.17");
    for (const row of rows)
      for (const value of Object.values(row)) expect(value).not.toMatch(/\d\.\d{3,}/);
  });
});

describe("the unit goes with the weights", () => {
  it("names the job's unit on every exported row and reads it back", () => {
    const csv = weightsToCsv(saved, "g");
    expect(Papa.parse(csv, { header: true }).data).toEqual([
      { cylinder: "1", part: "piston", phase: "first", weight: "400.0", unit: "g" },
    ]);
    expect(previewWeightsCsv(csv, job, saved, "initial")).toMatchObject({
      unchanged: 1,
      errors: [],
    });
  });

  it("refuses weights in ounces for a job weighed in grams, naming the line", () => {
    const csv = ["cylinder,part,weight,unit", "1,piston,14.110,oz", "2,piston,401.2,g"].join("\n");
    const p = previewWeightsCsv(csv, job, [], "initial");
    expect(p.errors).toEqual([
      {
        line: 2,
        message:
          "This weight is in ounces, but the job is weighed in grams: convert it, or change the job's unit before weighing.",
      },
    ]);
    expect(p.changes.map((c) => c.next)).toEqual([["401.2"]]);
  });
});
