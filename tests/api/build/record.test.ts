import { beforeEach, describe, expect, it } from "vitest";
import { PUT as putSection } from "@/app/api/jobs/[id]/build/[section]/route";
import { GET as getRecord } from "@/app/api/jobs/[id]/build/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import { createJob, updateJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { BuildRecordView } from "@/lib/build-record/record";
import { emptySection } from "@/lib/build-record/schemas";
import { addTestUser } from "../../helpers/db";
import { setUpBuildJob } from "./fixtures";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

beforeEach(async () => {
  ({ db, users, job } = await setUpBuildJob({ engine: "Invented small-block V8" }));
  signInAs(users.machinist);
});

const SPECS = {
  ...emptySection("specs", "in"),
  bore: "4.030",
  stroke: "3.480",
  ringFactors: { top: "0.0045", second: "0.0050", oil: ".0040" },
};

function put(section: string, data: unknown, version = 0, jobId = job.id) {
  return putSection(
    jsonRequest("PUT", "/x", { version, data }),
    params({ id: String(jobId), section }),
  );
}

async function get(jobId = job.id) {
  return getRecord(jsonRequest("GET", "/x"), params({ id: String(jobId) }));
}

async function recordOf(res: Response): Promise<BuildRecordView> {
  expect(res.status).toBe(200);
  return ((await res.json()) as { record: BuildRecordView }).record;
}

async function fieldsOf(res: Response) {
  return ((await res.json()) as { error: { fields: Record<string, string> } }).error.fields;
}

describe("GET /api/jobs/:id/build", () => {
  it("answers an empty record in the job's length unit, every section at version 0", async () => {
    const record = await recordOf(await get());
    expect(record.versions.specs.version).toBe(0);
    expect(record.data.specs.lengthUnit).toBe("mm"); // the job was booked in mm (the default)
    expect(record.data.rings.rows).toEqual([]);
  });

  it("the counter reads it; a customer reads their own only once the job is ready (null before)", async () => {
    signInAs(users.counter);
    expect((await get()).status).toBe(200);
    signInAs(users.customer);
    const before = await get();
    expect(before.status).toBe(200);
    expect(((await before.json()) as { record: unknown }).record).toBeNull();
    await updateJob(db, job.id, job.version, { status: "ready" }, null);
    expect((await recordOf(await get())).jobId).toBe(job.id);
    signInAs(await addTestUser(db, "customer"));
    expect((await get()).status).toBe(404);
  });
});

describe("PUT /api/jobs/:id/build/:section", () => {
  it("saves the engine's figures and works out each ring's gap (hand arithmetic)", async () => {
    let record = await recordOf(await put("specs", SPECS));
    expect(record.versions.specs.version).toBe(1);
    expect(record.data.specs.ringFactors.oil).toBe("0.0040"); // ".0040" kept with its zero
    record = await recordOf(
      await put("rings", {
        rows: [
          { cylinder: 1, ring: "top", readings: ["0.015"], done: false },
          { cylinder: 1, ring: "second", readings: ["0.016", "0.021"], done: true },
        ],
      }),
    );
    // Gap = factor × bore (common practice): 0.0045 × 4.030 = 0.018135 in; 0.018135 − 0.015 =
    // 0.003135 in still to file. Second ring: 0.0050 × 4.030 = 0.02015; 0.021 is above it.
    const [top, second] = record.results.rings;
    expect(top!.result).toEqual({
      ok: true,
      value: { target: "0.018135", fileOff: "0.003135", status: "tight" },
    });
    expect(second!.measured).toBe("0.021");
    expect(second!.result).toMatchObject({ ok: true, value: { target: "0.02015", status: "ok" } });
    const audit = await listAuditEntries(db, "build_section", `${job.id}:rings`);
    expect(audit).toHaveLength(1);
  });

  it("refuses a ring ticked done while its last gap is tight (422 on that row's tick)", async () => {
    await put("specs", SPECS);
    const res = await put("rings", {
      rows: [
        { cylinder: 2, ring: "top", readings: ["0.020"], done: true },
        { cylinder: 3, ring: "top", readings: ["0.019", "0.017"], done: true },
      ],
    });
    expect(res.status).toBe(422);
    const fields = await fieldsOf(res);
    expect(Object.keys(fields)).toEqual(["data.rows.1.done"]);
    expect(fields["data.rows.1.done"]).toMatch(/Cylinder 3 top ring: still tight/);
  });

  it("refuses a typing slip by field, and a cylinder the engine does not have", async () => {
    let res = await put("tdc", { firstStop: "-18", secondStop: "2x" });
    expect(res.status).toBe(422);
    expect(Object.keys(await fieldsOf(res))).toEqual(["data.secondStop"]);
    res = await put("deck", { rows: [{ cylinder: 9, deckClearance: "0.005", chamberCc: null }] });
    expect(res.status).toBe(422);
    expect(await fieldsOf(res)).toEqual({
      "data.rows.0.cylinder": "Cylinder 9: this engine has 8 cylinders.",
    });
  });

  it("refuses switching inches to mm while lengths are recorded in inches (422 on the unit)", async () => {
    await put("specs", SPECS);
    const res = await put("specs", { ...SPECS, lengthUnit: "mm" }, 1);
    expect(res.status).toBe(422);
    const fields = await fieldsOf(res);
    expect(Object.keys(fields)).toEqual(["data.lengthUnit"]);
    // The stored figures: bore and stroke (the factors are ratios, not lengths).
    expect(fields["data.lengthUnit"]).toMatch(/already has 2 lengths in inches/);
    // A record with no lengths yet may change unit freely.
    const fresh = await createJob(
      db,
      { customerId: users.customer.customerId!, engine: "Invented flat four" },
      null,
    );
    const switched = await put(
      "specs",
      { ...emptySection("specs", "mm"), lengthUnit: "in" },
      0,
      fresh.id,
    );
    expect(switched.status).toBe(200);
  });

  it("works out the pointer correction from the two stop readings", async () => {
    const record = await recordOf(await put("tdc", { firstStop: "-18", secondStop: "22" }));
    // True TDC midway between the stops: (−18 + 22) / 2 = 2°; each stop (22 − (−18)) / 2 = 20°.
    expect(record.results.tdc).toEqual({ ok: true, value: { offset: "2", eachSide: "20" } });
  });

  it("keeps every cam check and gives each one's centreline and move against the card", async () => {
    await put("specs", {
      ...SPECS,
      cam: {
        intakeOpenBtdc: "31",
        intakeCloseAbdc: "63",
        exhaustOpenBbdc: "73",
        exhaustCloseAtdc: "21",
        installCentreline: null,
      },
    });
    const record = await recordOf(
      await put("cam", {
        lift: "0.050",
        checks: [
          { openingSide: "63", closingSide: "154", final: false },
          { openingSide: "62", closingSide: "150", final: true },
        ],
      }),
    );
    // Card: intake duration 31 + 180 + 63 = 274, ICL 274/2 − 31 = 106° ATDC.
    expect(record.results.installCentreline).toBe("106");
    // Check 1: (63 + 154) / 2 = 108.5 → 2.5° retarded: advance 2.5 crank degrees (1.25 at the cam).
    expect(record.results.cam[0]!.correction).toMatchObject({
      ok: true,
      value: { move: "2.5", direction: "advance", camDegrees: "1.25" },
    });
    // Check 2: (62 + 150) / 2 = 106 → on the card.
    expect(record.results.cam[1]!.centreline).toMatchObject({
      ok: true,
      value: { centreline: "106", phasing: "on-card" },
    });
    expect(record.data.cam.checks).toHaveLength(2);
  });

  it("the counter cannot write (403); an unknown section or someone else's job is 404", async () => {
    signInAs(users.counter);
    expect((await put("tdc", { firstStop: "-18", secondStop: "22" })).status).toBe(403);
    signInAs(users.machinist);
    expect((await put("pushrods", {})).status).toBe(404);
    expect((await put("tdc", { firstStop: null, secondStop: null }, 0, 9999)).status).toBe(404);
  });

  it("a write based on an older version is refused (409) and the stored one kept", async () => {
    expect((await put("tdc", { firstStop: "-18", secondStop: "22" }, 0)).status).toBe(200);
    const stale = await put("tdc", { firstStop: "-20", secondStop: "20" }, 0);
    expect(stale.status).toBe(409);
    expect(((await stale.json()) as { currentVersion: number }).currentVersion).toBe(1);
    const record = await recordOf(await get());
    expect(record.data.tdc).toEqual({ firstStop: "-18", secondStop: "22" });
    expect((await put("tdc", { firstStop: "-20", secondStop: "20" }, 1)).status).toBe(200);
  });
});
