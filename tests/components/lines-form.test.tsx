// @vitest-environment jsdom
import { cleanup, render, screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { type LinePayload, LinesEditor } from "@/components/billing/lines-editor";
import type { PriceItem } from "@/db/prices";
import type { DocumentLine } from "@/db/quotes";

afterEach(cleanup);

const line = (id: number, code: string, quantity: string, unitPrice: string): DocumentLine => ({
  id,
  position: id,
  priceItemId: id,
  code,
  description: `${code} work`,
  quantity,
  unitPrice,
  lineTotal: "0.00",
});

const price: PriceItem = {
  id: 7,
  code: "RUSH",
  description: "Rush",
  kind: "rush",
  unitPrice: "120.00",
  active: true,
  version: 1,
  updatedAt: "2026-12-01T00:00:00Z",
};

function editor(onSave: (lines: LinePayload[]) => void) {
  render(
    <LinesEditor
      lines={[line(11, "BAL-I4", "1", "285.00"), line(12, "MCH-PIS", "8", "6.50")]}
      prices={[price]}
      currency="USD"
      taxRate="20"
      busy={false}
      onSave={onSave}
      actions={(dirty) => <span data-testid="dirty">{dirty ? "changed" : "saved"}</span>}
    />,
  );
}

describe("the line editor of a draft quote or invoice", () => {
  it("totals the lines as typed: 285.00 + 8 × 6.50 = 337.00, tax 20 % = 67.40, total 404.40 (by hand)", () => {
    editor(() => undefined);
    expect(screen.getByText("$337.00")).toBeTruthy();
    expect(screen.getByText("$67.40")).toBeTruthy();
    expect(screen.getByText("$404.40")).toBeTruthy();
    expect(screen.getByRole("button", { name: "Save lines" })).toHaveProperty("disabled", true);
  });

  it("moves a line up and sends the lines in the new order, kept lines by id", async () => {
    const onSave = vi.fn();
    editor(onSave);
    await userEvent.click(screen.getByRole("button", { name: "Move line 2 up" }));
    expect(within(screen.getByTestId("line-1")).getByText("MCH-PIS")).toBeTruthy();
    expect(screen.getByTestId("dirty").textContent).toBe("changed");
    await userEvent.click(screen.getByRole("button", { name: "Save lines" }));
    expect(onSave).toHaveBeenCalledWith([
      { lineId: 12, quantity: "8", description: "MCH-PIS work" },
      { lineId: 11, quantity: "1", description: "BAL-I4 work" },
    ]);
  });

  it("adds a line from the price list, removes one, and sends a new line by its price entry", async () => {
    const onSave = vi.fn();
    editor(onSave);
    await userEvent.selectOptions(screen.getByLabelText("Add a line from the price list"), "7");
    const qty = screen.getByLabelText("Line 3 quantity");
    await userEvent.clear(qty);
    await userEvent.type(qty, "2");
    await userEvent.click(
      within(screen.getByTestId("line-1")).getByRole("button", { name: "Remove" }),
    );
    // 8 × 6.50 + 2 × 120.00 = 52.00 + 240.00 = 292.00 (by hand)
    expect(screen.getByText("$292.00")).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Save lines" }));
    expect(onSave).toHaveBeenCalledWith([
      { lineId: 12, quantity: "8", description: "MCH-PIS work" },
      { priceItemId: 7, quantity: "2", description: "Rush" },
    ]);
  });

  it("marks a quantity that is not a number and shows no totals until it is", async () => {
    editor(() => undefined);
    const qty = screen.getByLabelText("Line 2 quantity");
    await userEvent.clear(qty);
    await userEvent.type(qty, "8O");
    expect(qty.getAttribute("aria-invalid")).toBe("true");
    expect(screen.queryByText("$404.40")).toBeNull();
  });
});
