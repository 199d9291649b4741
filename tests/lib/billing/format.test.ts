import { describe, expect, it } from "vitest";
import { formatQuantity, PAYMENT_METHOD_LABEL } from "@/lib/billing/format";
import { PAYMENT_METHOD_LABEL as SCREEN_LABEL } from "@/components/billing/labels";

// A quantity is a count or a measure on a line: shown as a person writes it. Each expected value is
// worked by hand from the stored decimal string (trailing zeros after the point carry no value).
describe("formatQuantity", () => {
  it("prints a whole number without decimals", () => {
    expect(formatQuantity("1")).toBe("1");
    expect(formatQuantity("2.000")).toBe("2"); // 2.000 = 2
    expect(formatQuantity("8.00")).toBe("8"); // eight rods
    expect(formatQuantity("10.0")).toBe("10"); // the zero before the point stays
    expect(formatQuantity("0.00")).toBe("0");
  });

  it("trims a part quantity to the digits that carry value, without rounding", () => {
    expect(formatQuantity("0.50")).toBe("0.5"); // half an hour
    expect(formatQuantity("1.25")).toBe("1.25");
    expect(formatQuantity("2.500")).toBe("2.5");
    expect(formatQuantity("0.333")).toBe("0.333"); // nothing dropped that is not a trailing zero
    expect(formatQuantity("120.050")).toBe("120.05");
  });

  it("keeps a sign and drops leading zeros, and returns anything else as stored", () => {
    expect(formatQuantity("-1.50")).toBe("-1.5");
    expect(formatQuantity("-0.00")).toBe("0"); // no negative zero
    expect(formatQuantity("007.10")).toBe("7.1");
    expect(formatQuantity("a few")).toBe("a few");
  });
});

describe("PAYMENT_METHOD_LABEL", () => {
  it("is the same set of words on the screens and on the invoice PDF", () => {
    expect(SCREEN_LABEL).toBe(PAYMENT_METHOD_LABEL);
    expect(Object.keys(PAYMENT_METHOD_LABEL).sort()).toEqual(
      ["bank-transfer", "card-in-shop", "cash", "online"].sort(),
    );
  });
});
