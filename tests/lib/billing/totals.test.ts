import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  compareMoney,
  fromMinorUnits,
  subtractMoney,
  sumMoney,
  toMinorUnits,
} from "@/lib/billing/money";
import { formatDocumentNumber } from "@/lib/billing/numbering";
import { computeTotals, lineTotal } from "@/lib/billing/totals";

// An independent computation of the same rule in integer arithmetic (BigInt), sharing no code
// with lib/billing: amounts are scaled to whole units of 10^-places and rounded half-up by hand.
function toScaled(text: string, places: number): bigint {
  const [whole, frac = ""] = text.split(".");
  return BigInt(whole! + frac.padEnd(places, "0").slice(0, places));
}
/** n / d rounded half away from zero, for n ≥ 0, d > 0. */
function divRoundHalfUp(n: bigint, d: bigint): bigint {
  return (n * 2n + d) / (2n * d);
}
function centsText(cents: bigint): string {
  const s = cents.toString().padStart(3, "0");
  return `${s.slice(0, -2)}.${s.slice(-2)}`;
}
function referenceTotals(lines: { quantity: string; unitPrice: string }[], rate: string) {
  // quantity has ≤ 3 places, unit price ≤ 4: the product is in units of 10^-7.
  const lineCents = lines.map((l) =>
    divRoundHalfUp(toScaled(l.quantity, 3) * toScaled(l.unitPrice, 4), 100_000n),
  );
  const subtotal = lineCents.reduce((a, b) => a + b, 0n);
  // rate has ≤ 4 places and is a percent: tax = subtotal × rate / 100 / 10^4.
  const tax = divRoundHalfUp(subtotal * toScaled(rate, 4), 1_000_000n);
  return {
    lineTotals: lineCents.map(centsText),
    subtotal: centsText(subtotal),
    tax: centsText(tax),
    total: centsText(subtotal + tax),
  };
}

describe("computeTotals", () => {
  it("adds 0.10 and 0.20 to exactly 0.30 (the binary floating-point trap)", () => {
    const t = computeTotals(
      [
        { quantity: "1", unitPrice: "0.10" },
        { quantity: "1", unitPrice: "0.20" },
      ],
      "0",
    );
    expect(0.1 + 0.2).not.toBe(0.3);
    expect(t).toEqual({
      lineTotals: ["0.10", "0.20"],
      subtotal: "0.30",
      tax: "0.00",
      total: "0.30",
    });
  });

  it("rounds each line half-up to cents before adding (3 × 0.125 = 0.375 → 0.38)", () => {
    expect(lineTotal("3", "0.125")).toBe("0.38");
    expect(lineTotal("1", "0.005")).toBe("0.01");
    expect(lineTotal("1", "0.0049")).toBe("0.00");
    // 1.005 is 1.00499999999999989… as a double; in decimals it is exactly half a cent over.
    expect(lineTotal("1", "1.005")).toBe("1.01");
    expect((1.005).toFixed(2)).toBe("1.00");
  });

  it("sums the rounded lines, so the printed lines always add up to the subtotal", () => {
    const t = computeTotals(
      [
        { quantity: "1", unitPrice: "0.005" },
        { quantity: "1", unitPrice: "0.005" },
        { quantity: "1", unitPrice: "0.005" },
      ],
      "0",
    );
    // 0.01 + 0.01 + 0.01, not round(0.015) = 0.02.
    expect(t.lineTotals).toEqual(["0.01", "0.01", "0.01"]);
    expect(t.subtotal).toBe("0.03");
  });

  it("rounds tax once, half-up, on the subtotal", () => {
    // 10.05 × 20 % = 2.01 exactly; 0.25 × 8.25 % = 0.020625 → 0.02; 0.30 × 8.875 % = 0.026625 → 0.03.
    expect(computeTotals([{ quantity: "1", unitPrice: "10.05" }], "20").tax).toBe("2.01");
    expect(computeTotals([{ quantity: "1", unitPrice: "0.25" }], "8.25").tax).toBe("0.02");
    expect(computeTotals([{ quantity: "1", unitPrice: "0.30" }], "8.875").tax).toBe("0.03");
    // 0.10 × 5 % = 0.005 exactly: half a cent rounds up.
    expect(computeTotals([{ quantity: "1", unitPrice: "0.10" }], "5")).toMatchObject({
      tax: "0.01",
      total: "0.11",
    });
  });

  it("handles a typical balancing job", () => {
    const t = computeTotals(
      [
        { quantity: "1", unitPrice: "395.00" },
        { quantity: "8", unitPrice: "6.50" },
        { quantity: "8", unitPrice: "9.75" },
        { quantity: "1.5", unitPrice: "85.00" },
      ],
      "8.25",
    );
    // 395 + 52 + 78 + 127.50 = 652.50; 652.50 × 0.0825 = 53.83125 → 53.83.
    expect(t).toEqual({
      lineTotals: ["395.00", "52.00", "78.00", "127.50"],
      subtotal: "652.50",
      tax: "53.83",
      total: "706.33",
    });
  });

  it("stays exact over many lines where floats drift", () => {
    const lines = Array.from({ length: 1000 }, () => ({ quantity: "1", unitPrice: "0.10" }));
    let float = 0;
    for (const _ of lines) float += 0.1;
    expect(float).not.toBe(100);
    expect(computeTotals(lines, "0").subtotal).toBe("100.00");
  });

  it("agrees with an integer-cents (BigInt) computation on random documents", () => {
    // "12", "12.5", "12.050": whole part, then optionally up to `places` decimals.
    const decimal = (whole: number, places: number) =>
      fc
        .tuple(
          fc.integer({ min: 0, max: 10 ** whole - 1 }),
          fc.integer({ min: 0, max: places }),
          fc.integer({ min: 0, max: 10 ** places - 1 }),
        )
        .map(([w, n, f]) =>
          n === 0 ? `${w}` : `${w}.${String(f).padStart(places, "0").slice(0, n)}`,
        );
    const line = fc.record({ quantity: decimal(4, 3), unitPrice: decimal(6, 4) });
    const rate = fc.oneof(fc.constantFrom("0", "20", "8.25", "8.875", "7.5", "100"), decimal(2, 4));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 60 }), rate, (lines, r) => {
        expect(computeTotals(lines, r)).toEqual(referenceTotals(lines, r));
      }),
      { numRuns: 400 },
    );
  });

  it("refuses values that are not plain decimal strings", () => {
    expect(() => computeTotals([{ quantity: "1e3", unitPrice: "1" }], "0")).toThrow(
      /quantity|decimal/,
    );
    expect(() => computeTotals([{ quantity: "1", unitPrice: "-1" }], "0")).toThrow();
    expect(() => computeTotals([], "twenty")).toThrow();
  });

  it("gives zeros for a document with no lines", () => {
    expect(computeTotals([], "20")).toEqual({
      lineTotals: [],
      subtotal: "0.00",
      tax: "0.00",
      total: "0.00",
    });
  });
});

describe("money helpers", () => {
  it("convert to and from cents exactly", () => {
    expect(toMinorUnits("706.33")).toBe(70633);
    expect(toMinorUnits("0.29")).toBe(29); // 0.29 × 100 is 28.999999999999996 in floats
    expect(fromMinorUnits(70633)).toBe("706.33");
    expect(fromMinorUnits(5)).toBe("0.05");
    expect(() => toMinorUnits("1.005")).toThrow(/cent/);
  });

  it("add, subtract and compare without drift", () => {
    expect(sumMoney(["0.10", "0.20"])).toBe("0.30");
    expect(subtractMoney("0.30", "0.10")).toBe("0.20");
    expect(subtractMoney("0.10", "0.10")).toBe("0.00");
    expect(compareMoney("0.30", "0.3")).toBe(0);
    expect(compareMoney("10.00", "9.99")).toBe(1);
  });
});

describe("formatDocumentNumber", () => {
  it("writes prefix, year and a four-digit sequence, wider past 9999", () => {
    expect(formatDocumentNumber("invoice", 2026, 1)).toBe("INV-2026-0001");
    expect(formatDocumentNumber("quote", 2026, 42)).toBe("Q-2026-0042");
    expect(formatDocumentNumber("invoice", 2026, 12345)).toBe("INV-2026-12345");
  });
});
