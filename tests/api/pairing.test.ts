import { beforeEach, describe, expect, it } from "vitest";
import { POST as applyPairing } from "@/app/api/jobs/[id]/pairing/route";
import { POST as undoPairing } from "@/app/api/jobs/[id]/pairing/undo/route";
import { PATCH as patchJob } from "@/app/api/jobs/[id]/route";
import { PUT as putWeight } from "@/app/api/jobs/[id]/weights/route";
import { GET as getWorkshop } from "@/app/api/jobs/[id]/workshop/route";
import { describeChange } from "@/components/jobs/change-sentences";
import { listJobChanges } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Job } from "@/db/jobs";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import type { Workshop } from "@/lib/workshop/load";
import { addOneOfEachRole, countRows, freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";
import { bookFourMatchedByCylinder } from "./support/four-by-cylinder";

let db: DB;
let users: Record<Role, User>;
let job: Job;

// A made-up in-line four, grams (the same set as tests/lib/workshop/plan.test.ts).
const FOUR: Record<string, string[]> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

const id = () => params({ id: String(job.id) });

async function workshop(): Promise<Workshop> {
  const res = await getWorkshop(jsonRequest("GET", "/x"), id());
  expect(res.status).toBe(200);
  return res.json();
}

const pistons = (ws: Workshop) =>
  [1, 2, 3, 4].map(
    (c) => ws.weights.find((w) => w.cylinder === c && w.kind === "piston")!.readings[0],
  );

const apply = (body: unknown) => applyPairing(jsonRequest("POST", "/x", body), id());
const undo = (body: unknown) => undoPairing(jsonRequest("POST", "/x", body), id());

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  job = await bookFourMatchedByCylinder(users);
  for (const [kind, values] of Object.entries(FOUR))
    for (const [i, v] of values.entries()) {
      const write = { cylinder: i + 1, kind: kind as PartKind, phase: "initial", readings: [v] };
      const res = await putWeight(jsonRequest("PUT", "/x", { ...write, version: 0 }), id());
      expect(res.status).toBe(200);
    }
});

describe("piston-to-rod pairing", () => {
  it("is suggested with the plan's own saving when matching by cylinder", async () => {
    const ws = await workshop();
    expect(ws.job.spec.matching).toBe("by-cylinder");
    // Hand-worked in tests/lib/workshop/plan.test.ts: 5.5 g as numbered, 2.3 g re-paired.
    expect(ws.plan.pairing).toMatchObject({ removedNumbered: "5.5", removedSuggested: "2.3" });
    expect(ws.lastPairing).toBeNull();
  });

  it("applies a pairing, records it as a sentence, and undoes it one step back", async () => {
    const ws = await workshop();
    const res = await apply({ assignment: ws.plan.pairing!.assignment, lastPairingId: 0 });
    expect(res.status).toBe(200);
    const after: Workshop = await res.json();
    // rod 1 ← piston 4, rod 2 ← piston 3, rod 3 ← piston 1, rod 4 ← piston 2.
    expect(pistons(after)).toEqual(["400.9", "400.3", "400.0", "401.2"]);
    // Small ends stay with their rods.
    expect(after.weights.find((w) => w.cylinder === 1 && w.kind === "smallEnd")!.readings).toEqual([
      "150.0",
    ]);
    expect(after.lastPairing).toMatchObject({ action: "pair" });
    expect(after.plan.totalRemoved).toBe("2.3");
    expect(after.plan.pairing).toMatchObject({ changed: false });

    const [latest] = await listJobChanges(db, job.id);
    expect(describeChange(latest!, "g")).toEqual([
      "Pairing applied, pistons moved with their pins, retainers and rings: the piston of cylinder 1 → cylinder 3, the piston of cylinder 2 → cylinder 4, the piston of cylinder 3 → cylinder 2, the piston of cylinder 4 → cylinder 1",
    ]);

    const back = await undo({ pairingId: after.lastPairing!.id });
    expect(back.status).toBe(200);
    const undone: Workshop = await back.json();
    expect(pistons(undone)).toEqual(FOUR.piston);
    expect(undone.plan.totalRemoved).toBe("5.5");
    expect(undone.lastPairing).toMatchObject({ action: "pair-undo" });
    const [undoEntry] = await listJobChanges(db, job.id);
    expect(describeChange(undoEntry!, "g")[0]).toMatch(
      /^Pairing undone, pistons back on their rods: /,
    );

    // One step back only: the same undo again is refused, and nothing moves.
    const again = await undo({ pairingId: after.lastPairing!.id });
    expect(again.status).toBe(409);
    expect(pistons(await workshop())).toEqual(FOUR.piston);
  });

  it("refuses a pairing based on an older state of the pairings (409) and writes nothing", async () => {
    const ws = await workshop();
    expect((await apply({ assignment: ws.plan.pairing!.assignment })).status).toBe(200);
    const audit = await countRows(db, "audit_log");
    // A second machinist still looking at the page before the first pairing was applied.
    const stale = await apply({ assignment: ws.plan.pairing!.assignment, lastPairingId: 0 });
    expect(stale.status).toBe(409);
    expect(await countRows(db, "audit_log")).toBe(audit);
    expect(pistons(await workshop())).toEqual(["400.9", "400.3", "400.0", "401.2"]);
  });

  it("refuses an assignment that is not one piston per rod of this engine (422)", async () => {
    const twice = await apply({
      assignment: [
        { rodCylinder: 1, pistonFromCylinder: 2 },
        { rodCylinder: 2, pistonFromCylinder: 2 },
      ],
    });
    expect(twice.status).toBe(422);
    const outside = await apply({
      assignment: [
        { rodCylinder: 1, pistonFromCylinder: 5 },
        { rodCylinder: 5, pistonFromCylinder: 1 },
      ],
    });
    expect(outside.status).toBe(422);
    expect((await outside.json()).error.fields).toHaveProperty("assignment");
    expect(pistons(await workshop())).toEqual(FOUR.piston);
  });

  it("keeps pairing to the machinist: the counter gets 403, and undo needs a pairing", async () => {
    signInAs(users.counter);
    expect((await apply({ assignment: [{ rodCylinder: 1, pistonFromCylinder: 1 }] })).status).toBe(
      403,
    );
    expect((await undo({ pairingId: 1 })).status).toBe(403);
    signInAs(users.machinist);
    expect((await undo({ pairingId: 1 })).status).toBe(409);
  });

  it("offers no pairing when matching part by part", async () => {
    const patched = await patchJob(
      jsonRequest("PATCH", "/x", { version: job.version, spec: { matching: "by-part" } }),
      id(),
    );
    expect(patched.status).toBe(200);
    expect((await workshop()).plan.pairing).toBeNull();
  });
});
