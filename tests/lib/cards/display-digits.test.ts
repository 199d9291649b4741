import Decimal from "decimal.js";
import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { PartKind, Role } from "@/db/schema";
import type { User } from "@/db/users";
import { saveRotatingRecord } from "@/lib/workshop/save-rotating-record";
import { savePartTarget } from "@/lib/workshop/save-target";
import { savePartWeight } from "@/lib/workshop/save-weight";
import { convertMass, formatMass, massDecimals } from "@/lib/balance";
import { issueCard } from "@/lib/cards/issue";
import { findCardFile } from "@/lib/cards/list";
import { resolveSpecChanges } from "@/lib/jobs/settings";
import { DEMO_V8_WEIGHTS } from "@/lib/demo/v8-weights";
import { loadWorkshop } from "@/lib/workshop/load";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { createV8Job, createWeighedJob, FOUR_CYL_WEIGHTS, readPdf } from "../../api/cards/fixtures";

// The display rule (lib/balance/display.ts): a weighed mass at the scale resolution, a worked-out
// mass with one decimal more, an unbalance to two significant figures. This walks every warning
// the engine gives and every word of the balance card for a demo-like V8 in grams and an in-line
// four in ounces, and finds every figure that carries more digits than that.

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
});

const FIGURE = /-?\d+\.\d+/g;

/** Significant figures of a decimal token, ignoring leading zeros ("0.0040" → 2). */
const significant = (token: string) => token.replace(/[-.]/g, "").replace(/^0+/, "").length;

/**
 * Figures that break the rule: more decimals than a worked-out mass may carry at this
 * resolution, unless the figure keeps two significant figures or fewer (an unbalance or a
 * small correction, which may need more decimals not to read "0.00").
 */
function tooPrecise(text: string, resolution: string): string[] {
  const allowed = massDecimals(resolution) + 1;
  return (text.match(FIGURE) ?? []).filter((token) => {
    const decimals = token.split(".")[1]!.length;
    return decimals > allowed && significant(token) > 2;
  });
}

/** Re-writes a part's first weighing (`version` is the one stored: 1 once weighed, 0 before). */
async function weigh(
  jobId: number,
  cylinder: number,
  kind: PartKind,
  readings: string[],
  version = 1,
) {
  await savePartWeight(
    db,
    { jobId, cylinder, kind, phase: "initial", readings, baseVersion: version },
    null,
  );
}

async function warningsAndCard(job: Job) {
  const workshop = await loadWorkshop(db, job);
  expect(workshop.plan.error).toBeNull();
  const warnings = [
    ...(workshop.plan.removal?.warnings ?? []),
    ...(workshop.plan.finished?.warnings ?? []),
  ].map((w) => w.message);
  const card = await issueCard(db, job.id, users.machinist, {
    override: true,
    overrideReason: "Customer supplies the replacement pistons.",
  });
  const file = await findCardFile(db, job.id, card.revision, users.owner);
  const { text } = await readPdf(file.bytes);
  return { workshop, warnings, text: text.replace(/\s+/g, " ") };
}

describe("no figure carries more digits than the display rule", () => {
  it("on a demo-like V8 weighed in grams, with repeated readings, a set target and a rod total", async () => {
    const job = await createV8Job(db, users.customer.customerId!);
    // Three readings of one piston: a mean of 498.1666… g (1494.5 / 3, by hand).
    await weigh(job.id, 2, "piston", ["498.1", "498.2", "498.2"]);
    // Big and small end of rod 1 read three times; the whole rod once.
    await weigh(job.id, 1, "bigEnd", ["452.8", "452.9", "452.9"]);
    await weigh(job.id, 1, "smallEnd", ["184.2", "184.2", "184.2"]);
    // Every other rod weighs what its ends add up to; rod 1's ends add up to
    // 452.8666… + 184.2 = 637.0666… g (by hand), 0.53 g from its whole-rod reading.
    for (let c = 2; c <= 8; c += 1) {
      const ends = new Decimal(DEMO_V8_WEIGHTS.bigEnd[c - 1]!).plus(
        DEMO_V8_WEIGHTS.smallEnd[c - 1]!,
      );
      await weigh(job.id, c, "rodTotal", [ends.toFixed(1)], 0);
    }
    await weigh(job.id, 1, "rodTotal", ["637.6"], 0);
    // A piston target heavier than several pistons: they are light by a fraction of a reading.
    await savePartTarget(
      db,
      { jobId: job.id, kind: "piston", target: "498.15", baseVersion: 0 },
      null,
    );

    const { warnings, text } = await warningsAndCard(job);
    expect(warnings.length).toBeGreaterThan(0);
    for (const message of warnings) expect(tooPrecise(message, "0.1"), message).toEqual([]);
    expect(tooPrecise(text, "0.1")).toEqual([]);
    // The band as the engine enforces it (every part within the tolerance of the others).
    expect(text).toContain("all within 0.5 g of each other");
    expect(text).not.toContain("± 0.5");
    expect(text).not.toMatch(/\b0\.00 g/);
  });

  it("on an in-line four weighed in ounces, with a fine-grade crank whose allowance is under 0.005 g", async () => {
    // Booked in ounces: the settings come over from the gram defaults (0.1 g → 0.002 oz,
    // 0.5 g → 0.018 oz), as the settings service converts them.
    const { spec } = resolveSpecChanges(DEFAULT_SPEC, {
      layout: "inline-4",
      cylinders: 4,
      massUnit: "oz",
    });
    expect(spec).toMatchObject({ scaleResolution: "0.002", tolerance: "0.018" });
    // The four's gram weights read on an ounce scale: converted exactly (1 oz = 28.349523125 g,
    // NIST SP 811 App. B) and shown as the 0.002 oz scale would.
    const ounces = Object.fromEntries(
      Object.entries(FOUR_CYL_WEIGHTS).map(([kind, grams]) => [
        kind,
        grams!.map((g) => formatMass(convertMass(g, "g", "oz"), "0.002")),
      ]),
    );
    const job = await createWeighedJob(db, users.customer.customerId!, spec, ounces);
    // Three readings of one piston, 0.008 oz apart (more than the 0.002 oz scale resolution):
    // a mean of 14.1553… oz (42.466 / 3, by hand) and a spread warning.
    await weigh(job.id, 3, "piston", ["14.152", "14.154", "14.160"]);
    // A wrist pin target above two of the pins: light by 0.003 and 0.001 oz.
    await savePartTarget(
      db,
      { jobId: job.id, kind: "wristPin", target: "3.531", baseVersion: 0 },
      null,
    );
    // ISO 21940-11: U_per = 9549.3 · G · m / n = 9549.3 × 0.4 × 5 / 12000 = 1.59155 g·mm; half
    // per plane 0.795775 g·mm; at a 200 mm radius 0.00397888 g (by hand): "0.0040", never "0.00".
    await saveRotatingRecord(
      db,
      {
        jobId: job.id,
        part: "crankshaft",
        baseVersion: 0,
        data: {
          massKg: "5",
          rpm: 12000,
          grade: "G 0.4",
          radiusMm: "200",
          after: { A: { mass: "0.003" }, B: { mass: "0.002" } },
        },
      },
      null,
    );

    const { workshop, warnings, text } = await warningsAndCard(job);
    expect(workshop.plan.finished?.unit).toBe("oz");
    expect(warnings.length).toBeGreaterThan(0);
    for (const message of warnings) expect(tooPrecise(message, "0.002"), message).toEqual([]);
    expect(tooPrecise(text, "0.002")).toEqual([]);
    expect(text).toContain("resolution 0.002 oz");
    expect(text).toContain("all within 0.018 oz of each other");
    expect(text).toContain("0.0040 g");
    expect(text).not.toMatch(/\b0\.00 g/);
    // An in-line four is spun without bobweights: no factor is printed.
    expect(text).toContain("No bobweight needed");
    expect(text).not.toContain("Balance factor");
  });
});
