import { all, create, type FactoryFunctionMap } from "mathjs";
import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { formatDerivedMass } from "@/lib/balance";
import { parseCardData } from "@/lib/cards/card-data";
import { issueCard } from "@/lib/cards/issue";
import { findCardFile } from "@/lib/cards/list";
import { findCardByCode } from "@/db/cards";
import { DEMO_V8_WEIGHTS } from "@/lib/demo/v8-weights";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createV8Job, createWeighedJob, readPdf } from "../../api/cards/fixtures";

// mathjs with exact decimals: the reference for the mean of the pins.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

async function issueAndRead(jobId: number) {
  // The demo V8 has a wrist pin over the band (to re-select): issued with a stated reason.
  const card = await issueCard(db, jobId, users.machinist, {
    override: true,
    overrideReason: "Spare pin on order",
  });
  const file = await findCardFile(db, jobId, card.revision, users.owner);
  const stored = await findCardByCode(db, card.verificationCode.replace("-", ""));
  const data = parseCardData(stored!.dataJson);
  return { data, text: (await readPdf(file.bytes)).text.replace(/\s+/g, " ") };
}

describe("the balance card's bobweights", () => {
  it("print the oil allowance per rod and per pin, and the figure to build the set to", async () => {
    const job = await createWeighedJob(
      db,
      users.customer.customerId!,
      {
        layout: "v8-cross-plane",
        cylinders: 8,
        oilAllowancePerRod: "2",
        scaleName: "Bench scale, 0.1 g",
        balancerName: "Soft-bearing crank balancer",
      },
      DEMO_V8_WEIGHTS,
    );
    const { data, text } = await issueAndRead(job.id);
    // Two rods on each pin of a cross-plane V8: 2 × 2 g = 4 g on each pin.
    expect(data.bobweights.map((b) => b.oil)).toEqual(["4", "4", "4", "4"]);
    expect(text).toContain("oil allowance 2.00 g per rod, 4.00 g per pin");
    // The figure to build to is the mean of the four pins' bobweights (mathjs, exact decimals).
    const masses = data.bobweights.map((b) => math.bignumber(b.mass));
    const mean = math.format(math.mean(masses), { notation: "fixed" });
    expect(data.buildTo?.[0]?.mass).toBe(mean);
    expect(text).toContain("Build to, crankpins 1, 2, 3, 4 (2 rods each)");
    expect(text).toContain(`${formatDerivedMass(mean, "0.1")} g`);
  });

  it("keep the per-crankpin wording for a job set up that way, with the same bobweights as 2 g per rod", async () => {
    const perPin = await createV8Job(db, users.customer.customerId!); // 4 per crankpin
    const perRod = await createWeighedJob(
      db,
      users.customer.customerId!,
      { layout: "v8-cross-plane", cylinders: 8, oilAllowancePerRod: "2" },
      DEMO_V8_WEIGHTS,
    );
    const a = await issueAndRead(perPin.id);
    const b = await issueAndRead(perRod.id);
    expect(a.text).toContain("oil allowance 4 g per crankpin");
    expect(a.data.bobweights.map((x) => x.mass)).toEqual(b.data.bobweights.map((x) => x.mass));
  });
});
