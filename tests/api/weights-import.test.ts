import { beforeEach, describe, expect, it } from "vitest";
import { GET as planCsv } from "@/app/api/jobs/[id]/plan/csv/route";
import { GET as weightsCsv } from "@/app/api/jobs/[id]/weights/csv/route";
import { POST as importCsv } from "@/app/api/jobs/[id]/weights/import/route";
import type { DB } from "@/db/client";
import { type Job } from "@/db/jobs";
import { createJob } from "@/lib/jobs/save";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { addOneOfEachRole, countRows, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";

let db: DB;
let users: Record<Role, User>;
let job: Job;

const CSV =
  "cylinder,part,weight\n1,piston,400.0\n2,piston,401.2\n3,piston,four hundred\n4,piston,400.6\n";

const send = (body: unknown) =>
  importCsv(jsonRequest("POST", "/x", body), params({ id: String(job.id) }));

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await createJob(
    db,
    {
      customerId: users.customer.customerId!,
      engine: "four",
      spec: { layout: "inline-4", cylinders: 4 },
    },
    null,
  );
  signInAs(users.machinist);
});

describe("importing weights from a CSV", () => {
  it("shows what would change and writes nothing until confirmed", async () => {
    const before = await countRows(db, "audit_log");
    const res = await send({ csv: CSV });
    expect(res.status).toBe(200);
    const { confirmed, preview } = await res.json();
    expect(confirmed).toBe(false);
    expect(preview.changes).toHaveLength(3);
    expect(preview.errors).toEqual([
      { line: 4, message: '"four hundred" is not a weight: use digits and one point, like 498.6.' },
    ]);
    expect(await countRows(db, "audit_log")).toBe(before);
    expect(await db.selectFrom("part_weights").selectAll().execute()).toEqual([]);
  });

  it("writes the clean rows when confirmed, skips the refused one, and audits each", async () => {
    const preview = (await (await send({ csv: CSV })).json()).preview;
    const basedOn = Object.fromEntries(
      preview.changes.map(
        (c: { cylinder: number; kind: string; phase: string; version: number }) => [
          `${c.cylinder}:${c.kind}:${c.phase}`,
          c.version,
        ],
      ),
    );
    const res = await send({ csv: CSV, confirm: true, basedOn });
    const outcome = await res.json();
    expect(outcome).toMatchObject({ confirmed: true, imported: 3 });
    const pistons = outcome.workshop.weights
      .map((w: { cylinder: number; readings: string[] }) => `${w.cylinder}=${w.readings[0]}`)
      .sort();
    expect(pistons).toEqual(["1=400.0", "2=401.2", "4=400.6"]);
    expect(await countRows(db, "audit_log")).toBeGreaterThanOrEqual(3);
  });

  it("refuses the import (409) when a part changed after the preview, and writes none of it", async () => {
    const preview = (await (await send({ csv: CSV })).json()).preview;
    const basedOn = Object.fromEntries(
      preview.changes.map(
        (c: { cylinder: number; kind: string; phase: string; version: number }) => [
          `${c.cylinder}:${c.kind}:${c.phase}`,
          c.version,
        ],
      ),
    );
    await savePartWeight(
      db,
      {
        jobId: job.id,
        cylinder: 2,
        kind: "piston",
        phase: "initial",
        readings: ["399.9"],
        baseVersion: 0,
      },
      null,
    );
    const res = await send({ csv: CSV, confirm: true, basedOn });
    expect(res.status).toBe(409);
    const rows = await db
      .selectFrom("part_weights")
      .select(["cylinder", "readings_json"])
      .execute();
    expect(rows).toEqual([{ cylinder: 2, readings_json: '["399.9"]' }]);
  });

  it("is for the machinist and the owner: the counter gets 403", async () => {
    signInAs(users.counter);
    expect((await send({ csv: CSV })).status).toBe(403);
  });

  it("exports the weigh-in and the removal plan as CSV", async () => {
    const preview = (await (await send({ csv: CSV })).json()).preview;
    await send({
      csv: CSV,
      confirm: true,
      basedOn: Object.fromEntries(
        preview.changes.map(
          (c: { cylinder: number; kind: string; phase: string; version: number }) => [
            `${c.cylinder}:${c.kind}:${c.phase}`,
            c.version,
          ],
        ),
      ),
    });
    const res = await weightsCsv(jsonRequest("GET", "/x"), params({ id: String(job.id) }));
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toContain(`weigh-in-${job.number}.csv`);
    // Every row names the job's unit, so a file read elsewhere cannot be taken for ounces.
    expect(await res.text()).toContain("2,piston,first,401.2,g");
    const plan = await planCsv(jsonRequest("GET", "/x"), params({ id: String(job.id) }));
    expect((await plan.text()).split("\r\n")[0]).toBe(
      "cylinder,part,weighed,target,remove,how,finished,state,after_reweigh,unit",
    );
  });
});
