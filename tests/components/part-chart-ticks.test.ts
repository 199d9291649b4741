import { describe, expect, it } from "vitest";
import { evenTicks } from "@/components/workshop/part-chart";

// The chart's axis marks are printed at the scale resolution; placed anywhere else they read as
// uneven figures (14.09, 14.12, 14.14, 14.17, 14.18 on an ounce job's big ends). Worked by hand.
describe("the weight chart's axis marks", () => {
  it("fall on whole scale steps, evenly spaced, and cover the weights (0.01 oz scale)", () => {
    // Range 14.0875 to 14.1825 oz: 0.095 / 4 gaps = 0.02375, rounded up to whole 0.01 steps = 0.03;
    // first mark 0.03 × floor(14.0875 / 0.03) = 0.03 × 469 = 14.07; then +0.03 until past 14.1825.
    const { ticks, domain } = evenTicks(14.0875, 14.1825, 0.01);
    expect(ticks).toEqual([14.07, 14.1, 14.13, 14.16, 14.19]);
    expect(domain).toEqual([14.07, 14.19]);
  });

  it("use one scale step when the weights lie close together (0.1 g scale)", () => {
    // Range 141.55 to 142.95 g: 1.4 / 4 = 0.35, rounded up to whole 0.1 steps = 0.4;
    // first mark 0.4 × floor(141.55 / 0.4) = 0.4 × 353 = 141.2; marks to 143.2 (≥ 142.95).
    const { ticks } = evenTicks(141.55, 142.95, 0.1);
    expect(ticks).toEqual([141.2, 141.6, 142, 142.4, 142.8, 143.2]);
    // Every gap is the same whole number of scale steps.
    const gaps = ticks.slice(1).map((t, i) => Math.round((t - ticks[i]!) / 0.1));
    expect(new Set(gaps)).toEqual(new Set([4]));
  });
});
