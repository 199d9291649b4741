import { evaluate } from "mathjs";
import { beforeEach, describe, expect, it } from "vitest";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { POST as postJob } from "@/app/api/jobs/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { describeChange } from "@/components/jobs/change-sentences";
import { listJobChanges } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { addOneOfEachRole, freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

async function book(spec: Record<string, unknown>): Promise<Job> {
  signInAs(users.counter);
  const res = await postJob(
    jsonRequest("POST", "/api/jobs", {
      customerId: users.customer.customerId,
      engine: "invented test engine",
      spec,
    }),
    noParams,
  );
  expect(res.status).toBe(201);
  return (await res.json()).job;
}

/** Saves settings as the machinist, based on the job's current version. */
async function save(spec: Record<string, unknown>, as: User = users.machinist) {
  signInAs(as);
  const res = await patchJob(
    jsonRequest("PATCH", "/x", { version: job.version, spec }),
    params({ id: String(job.id) }),
  );
  const body = await res.json();
  if (res.status === 200) job = body.job;
  return { status: res.status, body };
}

async function sentences(): Promise<string[]> {
  const changes = await listJobChanges(db, job.id);
  return changes.flatMap((c) => describeChange(c, job.spec.massUnit));
}

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await book({ layout: "v8-cross-plane", cylinders: 8 });
});

describe("saving job settings", () => {
  it("accepts blanks wherever the form says blank is allowed", async () => {
    await save({ balanceFactor: "52", drillSize: "3/8", promisedDate: "2026-12-24" });
    const { status, body } = await save({
      balanceFactor: "",
      drillSize: "",
      promisedDate: "",
      maxRpm: "",
      bore: "",
    });
    expect(status).toBe(200);
    expect(body.job.spec).toMatchObject({
      balanceFactor: null,
      drillSize: null,
      drillDiameterMm: null,
      promisedDate: null,
      maxRpm: null,
      boreMm: null,
    });
  });

  it("names the field in the machinist's words in every refusal", async () => {
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ scaleResolution: "abc" }, "spec.scaleResolution", /^Scale resolution/],
      [{ tolerance: "0" }, "spec.tolerance", /^Tolerance must be more than zero/],
      [{ cylinders: "eight" }, "spec.cylinders", /^Cylinders: a whole number/],
      [{ maxRpm: "fast" }, "spec.maxRpm", /^Max service speed/],
      [{ balanceFactor: "120" }, "spec.balanceFactor", /^Balance factor: from 0 to 100 %/],
      [{ promisedDate: "next week" }, "spec.promisedDate", /^Promised for: a date/],
      [{ drillSize: "half a thumb" }, "spec.drillSize", /^Drill size "half a thumb"/],
      [{ bore: "4,030" }, "spec.bore", /^Bore: enter a number/],
      [{ cylinders: 6 }, "spec.cylinders", /V8.*8 cylinders/],
    ];
    for (const [spec, field, message] of cases) {
      const { status, body } = await save(spec);
      expect(status, JSON.stringify(spec)).toBe(422);
      expect(body.error.fields[field], JSON.stringify(spec)).toMatch(message);
      // Never zod's own wording.
      expect(JSON.stringify(body)).not.toMatch(/expected (string|number)|received NaN|Too big/);
    }
  });

  it("converts the resolution, tolerance and oil allowance when the job goes from grams to ounces, and says so", async () => {
    await save({ oilAllowancePerRod: "4" });
    const { status, body } = await save({
      massUnit: "oz",
      scaleResolution: "0.1",
      tolerance: "0.5",
      oilAllowancePerRod: "4",
    });
    expect(status).toBe(200);
    // 0.1 g = 0.0035274 oz: the coarsest 1/2/5 × 10^k step not coarser is 0.002 oz.
    // 0.5 g = 0.017637 oz → 0.018 oz, 4 g = 0.14110 oz → 0.14 oz (two significant figures).
    // The exact figures from mathjs' unit table (1 oz = 28.349523125 g):
    expect(evaluate("number(0.1 g, ounce)")).toBeCloseTo(0.0035274, 7);
    expect(evaluate("number(0.5 g, ounce)")).toBeCloseTo(0.017637, 6);
    expect(evaluate("number(4 g, ounce)")).toBeCloseTo(0.1411, 5);
    expect(body.job.spec).toMatchObject({
      massUnit: "oz",
      scaleResolution: "0.002",
      tolerance: "0.018",
      oilAllowancePerRod: "0.14",
    });
    expect(body.notices.join(" ")).toMatch(/scale resolution 0\.1 g is now 0\.002 oz/);
    expect(body.notices.join(" ")).toMatch(/tolerance 0\.5 g is now 0\.018 oz/);
  });

  it("keeps a figure typed in the new unit alongside the switch", async () => {
    const { body } = await save({ massUnit: "oz", scaleResolution: "0.1", tolerance: "0.02" });
    expect(body.job.spec).toMatchObject({ scaleResolution: "0.002", tolerance: "0.02" });
  });

  it("converts the gram defaults of a job booked in ounces", async () => {
    job = await book({ layout: "inline-4", cylinders: 4, massUnit: "oz" });
    expect(job.spec).toMatchObject({
      massUnit: "oz",
      scaleResolution: "0.002",
      tolerance: "0.018",
    });
  });

  it("refuses to switch units while weights are recorded in the old one, naming the field", async () => {
    signInAs(users.machinist);
    const res = await putWeight(
      jsonRequest("PUT", "/x", {
        cylinder: 1,
        kind: "piston",
        phase: "initial",
        readings: ["498.6"],
        version: 0,
      }),
      params({ id: String(job.id) }),
    );
    expect(res.status).toBe(200);
    const { status, body } = await save({ massUnit: "oz" });
    expect(status).toBe(422);
    expect(body.error.fields["spec.massUnit"]).toMatch(/^Weights in: .*recorded in grams/);
  });

  it("keeps lengths as typed in inches and gives the engine millimetres", async () => {
    const { body } = await save({ lengthUnit: "in", bore: "4.030", stroke: "3.480" });
    // 4.030 in × 25.4 = 102.362 mm; 3.480 in × 25.4 = 88.392 mm (1 in = 25.4 mm, NIST SP 811).
    expect(body.job.spec).toMatchObject({
      lengthUnit: "in",
      boreEntered: "4.030",
      boreMm: "102.362",
      strokeEntered: "3.480",
      strokeMm: "88.392",
    });
  });

  it("reads a drill size as written: 3/8 in is 9.525 mm", async () => {
    const { body } = await save({ drillSize: "3/8" });
    // 3/8 × 25.4 = 9.525 (by hand).
    expect(body.job.spec.drillDiameterMm).toBe("9.525");
    expect(body.job.spec.drillSize).toMatch(/^3\/8/);
  });

  it("does not keep a balance factor on a layout balanced without bobweights", async () => {
    job = await book({ layout: "inline-4", cylinders: 4 });
    const { status, body } = await save({ balanceFactor: "50" });
    expect(status).toBe(200);
    expect(body.job.spec.balanceFactor).toBeNull();
    expect(body.notices.join(" ")).toMatch(/no bobweight needed/);
  });
});

describe("the change history", () => {
  it("reads as sentences in trade words, with units, and leaves out saves that changed nothing", async () => {
    await save({ scaleResolution: "0.05" });
    await save({ material: JSON.stringify({ rod: "steel", piston: "aluminium2618" }) });
    await save({ lengthUnit: "in", bore: "4.030" });
    await save({ scaleResolution: "0.05" }); // no change
    await save({ balanceFactor: "" }); // blank stays blank: no change
    const lines = await sentences();
    expect(lines).toContain("Scale resolution changed from 0.1 g to 0.05 g");
    expect(lines).toContain("Piston material set to forged piston alloy 2618");
    expect(lines).toContain("Lengths now in inches");
    expect(lines).toContain("Bore set to 4.030 in");
    const changes = await listJobChanges(db, job.id);
    const shown = changes.filter((c) => describeChange(c, "g").length > 0);
    // Booked in, then three saves that changed something; the two that changed nothing are not shown.
    expect(shown).toHaveLength(4);
    for (const line of lines) {
      expect(line).not.toMatch(/[{}"]|\bempty\b|scaleResolution|massUnit|material:/);
    }
  });

  it("says what a weight and a target changed, with the job's unit", async () => {
    signInAs(users.machinist);
    await putWeight(
      jsonRequest("PUT", "/x", {
        cylinder: 3,
        kind: "piston",
        phase: "initial",
        readings: ["498.6"],
        version: 0,
      }),
      params({ id: String(job.id) }),
    );
    await putWeight(
      jsonRequest("PUT", "/x", {
        cylinder: 3,
        kind: "piston",
        phase: "initial",
        readings: ["498.4", "498.5"],
        version: 1,
      }),
      params({ id: String(job.id) }),
    );
    const lines = await sentences();
    expect(lines).toContain("Cylinder 3 piston weighed: 498.6 g (first weigh)");
    expect(lines).toContain(
      "Cylinder 3 piston changed from 498.6 g to 498.4, 498.5 g (first weigh)",
    );
  });
});
