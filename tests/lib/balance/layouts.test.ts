import { describe, expect, it } from "vitest";
import { findLayoutPreset, LAYOUT_PRESETS, type FixedLayoutPreset } from "@/lib/balance";

const fixed = (id: string) => {
  const preset = findLayoutPreset(id);
  if (preset === undefined || preset.custom) throw new Error(`no fixed preset ${id}`);
  return preset as FixedLayoutPreset;
};

describe("layout presets", () => {
  it("offers every layout the shop balances, and a custom one", () => {
    expect(LAYOUT_PRESETS.map((p) => p.id)).toEqual([
      "single",
      "parallel-twin-360",
      "parallel-twin-180",
      "inline-3",
      "inline-4",
      "inline-5",
      "inline-6",
      "flat-4",
      "flat-6",
      "v-twin",
      "v6-60",
      "v6-90",
      "v8-cross-plane",
      "v8-flat-plane",
      "v12",
      "custom",
    ]);
  });

  it("needs no bobweight where the throws cancel: in-line 4 and 6, flat-plane V8, flat 4 and 6 (DOMAIN §3, common practice)", () => {
    for (const id of ["inline-4", "inline-6", "v8-flat-plane", "flat-4", "flat-6", "v12"]) {
      expect(fixed(id)).toMatchObject({ bobweightNeeded: false, defaultBalanceFactor: null });
    }
  });

  it("uses 50 % for the cross-plane V8 (DOMAIN §3, common practice; NPTEL V-engine balancing)", () => {
    expect(fixed("v8-cross-plane")).toMatchObject({
      bobweightNeeded: true,
      defaultBalanceFactor: "50",
      rodsPerPin: 2,
    });
  });

  it("starts singles at 50 % within 50–60 % and V-twins at 60 % within 55–65 % (DOMAIN §3, common practice)", () => {
    expect(fixed("single")).toMatchObject({
      defaultBalanceFactor: "50",
      balanceFactorRange: ["50", "60"],
    });
    expect(fixed("v-twin")).toMatchObject({
      defaultBalanceFactor: "60",
      balanceFactorRange: ["55", "65"],
    });
    expect(fixed("parallel-twin-360")).toMatchObject({
      bobweightNeeded: true,
      balanceFactorRange: ["50", "90"],
    });
  });

  it("maps cylinders to crankpins consistently with rods per pin", () => {
    expect(fixed("v8-cross-plane").crankpins).toEqual([1, 1, 2, 2, 3, 3, 4, 4]);
    expect(fixed("inline-4").crankpins).toEqual([1, 2, 3, 4]);
    for (const preset of LAYOUT_PRESETS) {
      if (preset.custom) continue;
      expect(preset.crankpins).toHaveLength(preset.cylinders);
      const counts = new Map<number, number>();
      for (const pin of preset.crankpins) counts.set(pin, (counts.get(pin) ?? 0) + 1);
      expect(Math.max(...counts.values())).toBeLessThanOrEqual(preset.rodsPerPin);
      expect(preset.bobweightNeeded).toBe(preset.defaultBalanceFactor !== null);
      expect(preset.source.length).toBeGreaterThan(20);
    }
  });

  it("returns undefined for an unknown id", () => {
    expect(findLayoutPreset("w16")).toBeUndefined();
    expect(findLayoutPreset("custom")?.custom).toBe(true);
  });
});
