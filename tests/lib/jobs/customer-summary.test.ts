import { describe, expect, it } from "vitest";
import { customerWorkDone } from "@/lib/jobs/customer-summary";
import type { Workshop } from "@/lib/workshop/load";

/** A finished job with only what the customer's sentences read: no weights, no rotating parts. */
function workshop(buildTo: { rodsPerPin: number; pins: { crankpin: number; mass: string }[] }[]) {
  const sets = buildTo.map((set) => {
    // The set is built to the mean of its pins (lib/balance/build-to.ts); worked here anew.
    const sum = set.pins.reduce((a, p) => a + Number(p.mass), 0);
    return { ...set, mass: String(sum / set.pins.length) };
  });
  return {
    job: { spec: { massUnit: "g", scaleResolution: "0.1" } },
    weights: [],
    rotating: [],
    plan: { reweighed: 0, finished: { bobweightNeeded: true, buildTo: sets } },
  } as unknown as Workshop;
}

describe("the customer's bobweight sentence", () => {
  it("lists each crankpin's figure as the card does, and names the mean as the figure built to", () => {
    // By hand, at a 0.1 g scale a computed mass shows two decimals (one more than the scale):
    // 1891.0833… → 1891.08, 1891.1166… → 1891.12 (halves away from zero). The mean:
    // (1891.05 + 1891.15 + 1891.08333… + 1891.11666…) / 4 = 7564.4 / 4 = 1891.10.
    const done = customerWorkDone(
      workshop([
        {
          rodsPerPin: 2,
          pins: [
            { crankpin: 1, mass: "1891.05" },
            { crankpin: 2, mass: "1891.15" },
            { crankpin: 3, mass: "1891.083333333333333" },
            { crankpin: 4, mass: "1891.116666666666667" },
          ],
        },
      ]),
    );
    expect(done).toEqual([
      "Bobweights for the crankshaft balance, one per crankpin as on the balance card: crankpin 1 1891.05\u00a0g, crankpin 2 1891.15\u00a0g, crankpin 3 1891.08\u00a0g and crankpin 4 1891.12\u00a0g; built to their mean, 1891.10\u00a0g.",
    ]);
  });

  it("says one figure once where every pin's is the same, a non-breaking space before the unit", () => {
    const done = customerWorkDone(
      workshop([
        {
          rodsPerPin: 1,
          pins: [
            { crankpin: 1, mass: "1020.4" },
            { crankpin: 2, mass: "1020.4" },
            { crankpin: 3, mass: "1020.4" },
          ],
        },
      ]),
    );
    expect(done).toEqual([
      "Bobweight for the crankshaft balance: 1020.40\u00a0g, the same on crankpins 1, 2 and 3.",
    ]);
    expect(done[0]).not.toMatch(/\d g/);
  });
});
