// @vitest-environment jsdom
import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { DocumentLines } from "@/components/billing/document-lines";
import type { DocumentLine } from "@/db/document-lines";

afterEach(cleanup);

const line = (id: number, quantity: string, unitPrice: string, lineTotal: string) =>
  ({
    id,
    position: id,
    priceItemId: null,
    code: `L${id}`,
    description: `Line ${id}`,
    quantity,
    unitPrice,
    lineTotal,
  }) satisfies DocumentLine;

describe("DocumentLines", () => {
  it("prints each quantity as a person writes it, not as the database stores it", () => {
    // The quantity is stored as text, as the save that wrote it had it: "8.000" for eight pistons,
    // "1.500" for an hour and a half; the line reads 8 and 1.5 (8 × 12.00 = 96.00 and
    // 1.5 × 80.00 = 120.00, worked by hand).
    render(
      <DocumentLines
        lines={[line(1, "8.000", "12.00", "96.00"), line(2, "1.500", "80.00", "120.00")]}
        currency="USD"
        subtotal="216.00"
        taxRate="0"
        tax="0.00"
        total="216.00"
      />,
    );
    const cells = (n: number) =>
      Array.from(screen.getByText(`Line ${n}`).closest("tr")!.querySelectorAll("td")).map(
        (td) => td.textContent,
      );
    expect(cells(1)[2]).toBe("8");
    expect(cells(2)[2]).toBe("1.5");
  });
});
