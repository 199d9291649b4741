import Decimal from "decimal.js";
import { describe, expect, it } from "vitest";
import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import { buildWorkshopPlan, HOW_TO_REMOVE, HOW_TO_RESELECT } from "@/lib/workshop/plan";

// A made-up in-line four, grams; tolerance 0.5 g (common practice), scale 0.1 g.
//            piston  pin    small  big    rings
//   cyl 1    400.0   100.0  150.0  400.0  46.1
//   cyl 2    401.2   100.1  150.4  400.2  46.3
//   cyl 3    400.3   100.0  151.0  401.5  47.7
//   cyl 4    400.9   100.2  150.2  400.1  46.2
const FOUR: Partial<Record<PartKind, string[]>> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

function job(spec: Partial<Job["spec"]> = {}): Job {
  return {
    id: 1,
    number: "2026-0001",
    customerId: 1,
    customerName: "Test customer",
    engine: "in-line four",
    status: "machining",
    notes: null,
    version: 1,
    createdAt: "2026-12-01T00:00:00Z",
    updatedAt: "2026-12-01T00:00:00Z",
    spec: { ...DEFAULT_SPEC, layout: "inline-4", cylinders: 4, ...spec },
  };
}

function weights(
  set: Partial<Record<PartKind, string[]>>,
  reweighed: [number, PartKind, string][] = [],
): PartWeight[] {
  const row = (cylinder: number, kind: PartKind, phase: "initial" | "final", reading: string) =>
    ({
      cylinder,
      kind,
      phase,
      readings: [reading],
      version: 1,
      updatedAt: "2026-12-01T00:00:00Z",
      confirmedOutlier: false,
    }) as PartWeight;
  return [
    ...Object.entries(set).flatMap(([kind, values]) =>
      values!.map((v, i) => row(i + 1, kind as PartKind, "initial", v)),
    ),
    ...reweighed.map(([cylinder, kind, v]) => row(cylinder, kind, "final", v)),
  ];
}

describe("removal where the trade removes", () => {
  it("says where metal comes off each machined kind and offers no drill depth", () => {
    const plan = buildWorkshopPlan(job({ drillDiameterMm: "8" }), weights(FOUR), []);
    expect(plan).not.toHaveProperty("drill");
    expect(HOW_TO_REMOVE.piston).toBe("mill the pin bosses or under the crown (common practice)");
    expect(HOW_TO_REMOVE.smallEnd).toBe("grind the small-end pad");
    expect(HOW_TO_REMOVE.bigEnd).toBe("grind the big-end cap pad");
    for (const kind of ["rings", "wristPin", "retainers"] as const) {
      expect(HOW_TO_REMOVE[kind]).toBeUndefined();
      expect(HOW_TO_RESELECT[kind]).toMatch(/re-select/);
    }
    // By part: pistons to 400.0, band to 400.5: 401.2 − 400.0 = 1.2, 400.9 − 400.0 = 0.9.
    expect(plan.progress["2:piston"]).toEqual({ state: "to-do", amount: "1.2" });
    expect(plan.progress["4:piston"]).toEqual({ state: "to-do", amount: "0.9" });
  });

  it("reads a ring set over the band as re-select, never as metal to take off", () => {
    // Rings 46.1, 46.3, 47.7, 46.2: target 46.1, band to 46.6; 47.7 is 1.6 over.
    const rings = { ...FOUR, rings: ["46.1", "46.3", "47.7", "46.2"] };
    let plan = buildWorkshopPlan(job(), weights(rings), []);
    expect(plan.progress["3:rings"]).toEqual({ state: "reselect", amount: "1.6" });
    expect(plan.removal!.parts.filter((p) => p.kind === "rings").map((p) => p.remove)).toEqual([
      "0",
      "0",
      "0",
      "0",
    ]);
    // A re-selected set weighed 46.4 (within 46.1 + 0.5): done.
    plan = buildWorkshopPlan(job(), weights(rings, [[3, "rings", "46.4"]]), []);
    expect(plan.progress["3:rings"]).toEqual({ state: "done" });
  });
});

describe("closing the loop after the re-weigh (by part)", () => {
  // Pistons: target 400.0, band to 400.5. Piston 2 is to lose 1.2 (401.2 → 400.0).
  const at = (reading: string) =>
    buildWorkshopPlan(job(), weights(FOUR, [[2, "piston", reading]]), []);

  it("reads done when the re-weighed part is within the band", () => {
    const plan = at("400.3"); // 400.0 ≤ 400.3 ≤ 400.5
    expect(plan.progress["2:piston"]).toEqual({ state: "done" });
    expect(plan.progress["4:piston"]).toEqual({ state: "to-do", amount: "0.9" }); // not re-weighed
    expect(plan.overMachined).toEqual([]);
  });

  it("reads still to take off what is left over the target", () => {
    const plan = at("400.8"); // 400.8 > 400.5: still 400.8 − 400.0 = 0.8
    expect(plan.progress["2:piston"]).toEqual({ state: "still", amount: "0.8" });
  });

  it("reads over-machined, with the banner's choices and the cost of re-targeting", () => {
    const plan = at("399.6"); // 400.0 − 399.6 = 0.4 light
    expect(plan.progress["2:piston"]).toEqual({ state: "over", amount: "0.4" });
    expect(plan.overMachined).toEqual([{ cylinder: 2, kind: "piston", short: "0.4" }]);
    // Re-target the pistons to 399.6 (band to 400.1), from where they stand: piston 1 400.0 and
    // piston 4 400.0 (planned) are in band, piston 3 at 400.3 must lose 0.7 → 0.7 g in all.
    expect(plan.retarget).toEqual([{ kind: "piston", target: "399.6", extra: "0.7" }]);
  });
});

describe("a part light from the start", () => {
  it("stays with the replace list, not the over-machined banner, when re-weighed", () => {
    // Target set by hand at 400.5: piston 1 (400.0) is 0.5 light before any machining.
    const target = [{ kind: "piston" as const, target: "400.5", version: 1 }];
    const plan = buildWorkshopPlan(job(), weights(FOUR, [[1, "piston", "400.0"]]), target);
    expect(plan.removal!.parts[0]).toMatchObject({ status: "light", short: "0.5" });
    expect(plan.overMachined).toEqual([]);
    expect(plan.progress["1:piston"]).toBeUndefined();
  });
});

describe("matching by cylinder", () => {
  // Reciprocating (piston + pin + small end): 650.0, 651.7, 651.3, 651.3 → target 650.0, band
  // to 650.5; lightest piston 400.0, lightest small end 150.0.
  //   cyl 2: 1.7 over → piston 1.2 (401.2 → 400.0), small end 0.4 (150.4 → 150.0) → 650.1
  //   cyl 3: 1.3 over → piston 0.3, small end 1.0                                → 650.0
  //   cyl 4: 1.3 over → piston 0.9, small end 0.2 (150.2 → 150.0 at most)          → 650.2
  // = 4.0 off the reciprocating parts; big ends by part: 401.5 − 400.0 = 1.5 → 5.5 in all.
  const byCylinder = job({ matching: "by-cylinder" });

  it("plans the removal per assembly and totals it", () => {
    const plan = buildWorkshopPlan(byCylinder, weights(FOUR), []);
    expect(plan.matching).toBe("by-cylinder");
    expect(plan.totalRemoved).toBe("5.5");
    expect(plan.assemblies[2]).toEqual({ state: "to-do", amount: "1.6" });
    expect(plan.progress["2:smallEnd"]).toEqual({ state: "to-do", amount: "0.4" });
  });

  it("shows as saved the plan's own difference between the two numberings", () => {
    // Best pairing (assemblies piston + pin: 500.0, 501.3, 500.3, 501.1):
    //   rod 1 (150.0) ← piston 4: 651.1    rod 2 (150.4) ← piston 3: 650.7
    //   rod 3 (151.0) ← piston 1: 651.0    rod 4 (150.2) ← piston 2: 651.5
    // Target 650.7, band to 651.2: only rod 4 is over, by 0.8, off piston 2 (401.2 → 400.4).
    // The plan then takes off 0.8 + 1.5 (big end 3) = 2.3: saved 5.5 − 2.3 = 3.2.
    const plan = buildWorkshopPlan(byCylinder, weights(FOUR), []);
    expect(plan.pairing).toMatchObject({
      moves: [
        { rodCylinder: 1, pistonFromCylinder: 4 },
        { rodCylinder: 2, pistonFromCylinder: 3 },
        { rodCylinder: 3, pistonFromCylinder: 1 },
        { rodCylinder: 4, pistonFromCylinder: 2 },
      ],
      removedNumbered: "5.5",
      removedSuggested: "2.3",
      saved: "3.2",
      changed: true,
    });

    // A second derivation: apply the moves to the weights and plan the re-paired set afresh.
    const moved = Object.fromEntries(
      Object.entries(FOUR).map(([kind, values]) => [
        kind,
        ["piston", "wristPin"].includes(kind)
          ? [values[3], values[2], values[0], values[1]]
          : values,
      ]),
    ) as Partial<Record<PartKind, string[]>>;
    const after = buildWorkshopPlan(byCylinder, weights(moved), []);
    expect(after.totalRemoved).toBe("2.3");
    expect(new Decimal(plan.totalRemoved!).minus(after.totalRemoved!).toString()).toBe(
      plan.pairing!.saved,
    );
    // And the re-paired set is already as good as any.
    expect(after.pairing).toMatchObject({ changed: false, moves: [] });
  });

  it("makes no pairing claim when matching part by part", () => {
    const plan = buildWorkshopPlan(job(), weights(FOUR), []);
    expect(plan.matching).toBe("by-part");
    expect(plan.pairing).toBeNull();
  });

  it("closes the loop per assembly: done, still to take off, over-machined", () => {
    // Piston 2 planned 401.2 → 400.0; small end 2 planned 150.4 → 150.0 (not re-weighed here).
    const at = (reading: string) =>
      buildWorkshopPlan(byCylinder, weights(FOUR, [[2, "piston", reading]]), []);
    // 400.0 + 100.1 + 150.0 = 650.1: in the band → done; the small end is still to do.
    let plan = at("400.0");
    expect(plan.progress["2:piston"]).toEqual({ state: "done" });
    expect(plan.progress["2:smallEnd"]).toEqual({ state: "to-do", amount: "0.4" });
    expect(plan.assemblies[2]).toEqual({ state: "done" });
    // 400.6 + 100.1 + 150.0 = 650.7: 0.7 over 650.0, the piston can give 400.6 − 400.0 = 0.6
    // (down to the lightest piston) → 650.1, in band: still 0.6 off the piston.
    plan = at("400.6");
    expect(plan.progress["2:piston"]).toEqual({ state: "still", amount: "0.6" });
    // 399.5 + 100.1 + 150.0 = 649.6: 0.4 under 650.0 → over-machined, with the banner entry.
    plan = at("399.5");
    expect(plan.progress["2:piston"]).toEqual({ state: "over", amount: "0.4" });
    expect(plan.overMachined).toEqual([{ cylinder: 2, kind: "assembly", short: "0.4" }]);
    expect(plan.retarget.map((r) => [r.kind, r.target])).toEqual([["assembly", "649.6"]]);
    // Pairing is chosen before machining: none offered once parts are re-weighed.
    expect(plan.pairing).toBeNull();
  });
});
