import { describe, expect, it } from "vitest";
import {
  computeBalance,
  findLayoutPreset,
  LAYOUT_PRESETS,
  type FixedLayoutPreset,
} from "@/lib/balance";

const fixed = (id: string) => {
  const preset = findLayoutPreset(id);
  if (preset === undefined || preset.custom) throw new Error(`no fixed preset ${id}`);
  return preset as FixedLayoutPreset;
};
const factorOf = (id: string) => Number(fixed(id).defaultBalanceFactor) / 100;

/*
 * A second derivation of the balance factors, independent of the preset table: the primary
 * inertia force of each cylinder, summed as vectors over one revolution, then split into the
 * part that turns with the crank and the part that turns against it (textbook engine balance,
 * e.g. NPTEL "Dynamics of Machines", V-engine balancing lectures; Heywood 1988 ch. 2 for the
 * primary force m·r·ω²·cos θ along the cylinder axis).
 *
 * Forces are complex numbers x + iy in units of m·r·ω² for one cylinder's reciprocating mass m.
 * A cylinder whose axis points at angle φ, with its crank throw at angle θ, feels the primary
 * force cos(θ − φ) along its axis: F = cos(θ − φ)·e^{iφ}. Over a revolution the total force is
 * F(θ) = A·e^{iθ} + B·e^{−iθ}; A (turning with the crank) and B (turning against it) are found
 * by averaging F·e^{−iθ} and F·e^{iθ} over 360 equal steps (exact for this trigonometric sum).
 * A counterweight turns with the crank, so it can cancel A and nothing else.
 */
type C = { re: number; im: number };
const cis = (deg: number): C => ({
  re: Math.cos((deg * Math.PI) / 180),
  im: Math.sin((deg * Math.PI) / 180),
});
const add = (a: C, b: C): C => ({ re: a.re + b.re, im: a.im + b.im });
const mul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const scale = (a: C, k: number): C => ({ re: a.re * k, im: a.im * k });
const abs = (a: C) => Math.hypot(a.re, a.im);
const ZERO: C = { re: 0, im: 0 };

/** A cylinder: the direction of its axis, and its throw's angle relative to the crank's turn. */
interface Cylinder {
  axisDeg: number;
  throwDeg: number;
}

const primaryForce = (cylinders: Cylinder[], crankDeg: number): C =>
  cylinders.reduce((sum, c) => {
    const theta = crankDeg + c.throwDeg;
    return add(sum, scale(cis(c.axisDeg), Math.cos(((theta - c.axisDeg) * Math.PI) / 180)));
  }, ZERO);

/** A and B of F(θ) = A·e^{iθ} + B·e^{−iθ}, θ the turn of the crank. */
function split(cylinders: Cylinder[]): { withCrank: C; againstCrank: C } {
  let withCrank = ZERO;
  let againstCrank = ZERO;
  const steps = 360;
  for (let k = 0; k < steps; k++) {
    const f = primaryForce(cylinders, k);
    withCrank = add(withCrank, mul(f, cis(-k)));
    againstCrank = add(againstCrank, mul(f, cis(k)));
  }
  return { withCrank: scale(withCrank, 1 / steps), againstCrank: scale(againstCrank, 1 / steps) };
}

/** Two cylinders with their axes `vAngle` apart, both rods on one crankpin. */
const vTwin = (vAngle: number): Cylinder[] => [
  { axisDeg: 90 - vAngle / 2, throwDeg: 0 },
  { axisDeg: 90 + vAngle / 2, throwDeg: 0 },
];

describe("layout presets: the 90° V-twin, derived", () => {
  const twin = vTwin(90);

  it("has a primary force of constant size turning with the crank, half the two cylinders' (second derivation)", () => {
    const { withCrank, againstCrank } = split(twin);
    // Hand check at θ = 0 (throw along the x axis, cylinder axes at 45° and 135°):
    // cos(−45°)·e^{i45°} + cos(−135°)·e^{i135°}
    //   = 0.7071·(0.7071 + 0.7071i) − 0.7071·(−0.7071 + 0.7071i) = (0.5 + 0.5i) + (0.5 − 0.5i)
    //   = 1 + 0i: one cylinder's m·r·ω², along the throw.
    const atZero = primaryForce(twin, 0);
    expect(atZero.re).toBeCloseTo(1, 12);
    expect(atZero.im).toBeCloseTo(0, 12);
    // Along the throw at every crank angle, always the same size: A·e^{iθ} with |A| = 1 …
    expect(abs(againstCrank)).toBeCloseTo(0, 12);
    expect(abs(withCrank)).toBeCloseTo(1, 12);
    for (const deg of [0, 17, 90, 133, 250, 301]) {
      expect(abs(primaryForce(twin, deg))).toBeCloseTo(1, 12);
    }
    // … and 1 out of the 2 units of reciprocating mass on the pin is a factor of 0.5.
    expect(abs(withCrank) / twin.length).toBeCloseTo(0.5, 12);
  });

  it("starts at exactly the factor that leaves no primary force (50 %)", () => {
    const { withCrank, againstCrank } = split(twin);
    const residualPeak = (f: number) =>
      Math.abs(abs(withCrank) - f * twin.length) + abs(againstCrank);
    expect(residualPeak(factorOf("v-twin-90"))).toBeCloseTo(0, 12);
    expect(residualPeak(0.6)).toBeGreaterThan(0.19); // the old single V-twin figure leaves 0.2
    expect(fixed("v-twin-90")).toMatchObject({
      rodsPerPin: 2,
      cylinders: 2,
      bobweightNeeded: true,
    });
  });
});

describe("layout presets: narrow V-twins", () => {
  it("leave a counter-rotating force of cos(V angle) that no factor cancels, so the start is a trade figure (second derivation)", () => {
    for (const vAngle of [45, 52, 60, 75]) {
      const { withCrank, againstCrank } = split(vTwin(vAngle));
      expect(abs(withCrank)).toBeCloseTo(1, 12); // the part a counterweight can reach: still 50 %
      expect(abs(againstCrank)).toBeCloseTo(Math.cos((vAngle * Math.PI) / 180), 12);
      expect(abs(againstCrank)).toBeGreaterThan(0.25);
    }
  });

  it("start within the 55–65 % quoted for narrow V-twins (common practice) and say so", () => {
    const narrow = fixed("v-twin-narrow");
    const [low, high] = (narrow.balanceFactorRange ?? ["0", "0"]).map(Number) as [number, number];
    expect([low, high]).toEqual([55, 65]);
    const start = Number(narrow.defaultBalanceFactor);
    expect(start).toBeGreaterThanOrEqual(low);
    expect(start).toBeLessThanOrEqual(high);
    expect(narrow.source).toMatch(/common practice/);
    expect(narrow.source).toMatch(/engine maker|makers/);
  });

  it("keep the old V-twin id working for jobs booked with it, at the figure they were worked out with", () => {
    const old = fixed("v-twin");
    expect(old.defaultBalanceFactor).toBe("60");
    expect(old.replacedBy).toEqual(["v-twin-90", "v-twin-narrow"]);
    expect(old.label).toMatch(/choose 90° or narrower/);
    const cylinder = (number: number) => ({
      number,
      piston: "498",
      wristPin: "120",
      smallEnd: "160",
      bigEnd: "410",
    });
    // Two rods on the one pin, 60 %: 2 × 410 + 0.6 × 2 × (498 + 120 + 160) = 820 + 933.6 = 1753.6
    const result = computeBalance({
      layout: { preset: "v-twin" },
      cylinders: [cylinder(1), cylinder(2)],
    });
    expect(result.bobweights.map((b) => b.mass)).toEqual(["1753.6"]);
  });
});

describe("layout presets: the even-fire 90° V6 with split crankpins", () => {
  // Banks 90° apart (axes at 45° and 135°). Throws of the three pairs 120° apart; the second pin
  // of each pair is offset by δ. Cylinder i reaches top dead centre when its throw points up its
  // axis, at crank turn φ_i − throw_i. Even fire every 120° over 720° needs those six turns to
  // agree modulo 120°: left 135 − 120k ≡ 15, right 45 − 120k − δ ≡ 15 (mod 120) ⇒ δ = 30°.
  const offset = 30;
  const v6: Cylinder[] = [0, 1, 2].flatMap((k) => [
    { axisDeg: 135, throwDeg: 120 * k },
    { axisDeg: 45, throwDeg: 120 * k + offset },
  ]);

  it("fires evenly with the 30° offset, each rod on its own crankpin (hand derivation)", () => {
    const tdc = v6.map((c) => (((c.axisDeg - c.throwDeg) % 120) + 120) % 120);
    expect(new Set(tdc)).toEqual(new Set([15]));
    expect(new Set(v6.map((c) => c.throwDeg)).size).toBe(6);
    expect(fixed("v6-90-split")).toMatchObject({
      cylinders: 6,
      rodsPerPin: 1,
      bobweightNeeded: true,
      crankpins: [1, 2, 3, 4, 5, 6],
    });
  });

  it("needs half of each rod's reciprocating mass against the force turning with its own pin, and leaves no counter-rotating force over the engine (second derivation)", () => {
    for (const cylinder of v6) {
      const { withCrank } = split([cylinder]);
      // One cylinder alone: half its primary force turns with its throw, at the throw's angle.
      expect(abs(withCrank)).toBeCloseTo(0.5, 12);
      const along = mul(withCrank, cis(-cylinder.throwDeg));
      expect(along.re).toBeCloseTo(0.5, 12);
      expect(along.im).toBeCloseTo(0, 12);
    }
    // The counter-rotating halves of all six cancel as a force (they leave a couple, which
    // no counterweight reaches), so nothing argues for a factor other than 50 %.
    expect(abs(split(v6).againstCrank)).toBeCloseTo(0, 12);
    expect(factorOf("v6-90-split")).toBeCloseTo(abs(split([v6[0] as Cylinder]).withCrank), 12);
  });

  it("gives six bobweights of one rod each", () => {
    const cylinder = (number: number) => ({
      number,
      piston: "402",
      wristPin: "98",
      smallEnd: "150",
      bigEnd: "390",
    });
    // One rod per pin, 50 %: 390 + 0.5 × (402 + 98 + 150) = 390 + 325 = 715
    const result = computeBalance({
      layout: { preset: "v6-90-split" },
      cylinders: [1, 2, 3, 4, 5, 6].map(cylinder),
    });
    expect(result.bobweights.map((b) => [b.crankpin, b.cylinders, b.mass])).toEqual(
      [1, 2, 3, 4, 5, 6].map((n) => [n, [n], "715"]),
    );
  });
});

describe("layout presets: the rest", () => {
  it("needs no bobweight where the throws cancel: in-line 4 and 6, flat-plane V8, flat 4 and 6 (common practice)", () => {
    for (const id of ["inline-4", "inline-6", "v8-flat-plane", "flat-4", "flat-6", "v12"]) {
      expect(fixed(id)).toMatchObject({ bobweightNeeded: false, defaultBalanceFactor: null });
    }
  });

  it("uses the 90° V-twin's factor for the cross-plane V8, whose pins carry the same 90° pair (common practice)", () => {
    expect(fixed("v8-cross-plane")).toMatchObject({ bobweightNeeded: true, rodsPerPin: 2 });
    expect(factorOf("v8-cross-plane")).toBeCloseTo(abs(split(vTwin(90)).withCrank) / 2, 12);
  });

  it("starts singles within the 50–60 % quoted in the trade (common practice)", () => {
    const single = fixed("single");
    expect(single.balanceFactorRange).toEqual(["50", "60"]);
    expect(Number(single.defaultBalanceFactor)).toBeGreaterThanOrEqual(50);
    expect(Number(single.defaultBalanceFactor)).toBeLessThanOrEqual(60);
  });

  it("maps cylinders to crankpins consistently with rods per pin, and names a source for each", () => {
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
      for (const id of preset.replacedBy ?? []) expect(findLayoutPreset(id)?.custom).toBe(false);
    }
  });

  it("has one preset per id, and undefined for an unknown id", () => {
    const ids = LAYOUT_PRESETS.map((p) => p.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(findLayoutPreset("w16")).toBeUndefined();
    expect(findLayoutPreset("custom")?.custom).toBe(true);
  });
});
