// @vitest-environment jsdom
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { LinesForm, type LinesPayload } from "@/components/billing/lines-form";
import type { DocumentLine } from "@/db/document-lines";
import type { PriceItem } from "@/db/prices";

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

const item = (id: number, code: string, unitPrice: string, unit: PriceItem["unit"]): PriceItem => ({
  id,
  code,
  description: code === "RUSH" ? "Rush" : `${code} work`,
  kind: code === "RUSH" ? "rush" : "machining-per-part",
  unitPrice,
  unit,
  active: true,
  version: 1,
  updatedAt: "2026-12-01T00:00:00Z",
});

const rush = item(7, "RUSH", "120.00", "each");
const rods = item(8, "MCH-ROD", "9.75", "per-cylinder");

function form(
  onSave: (payload: LinesPayload) => Promise<Record<string, string> | null> = async () => null,
  cylinders: number | null = 8,
) {
  render(
    <LinesForm
      document={{
        version: 3,
        lines: [line(11, "BAL-I4", "1", "285.00"), line(12, "MCH-PIS", "8", "6.50")],
        currency: "USD",
        taxRate: "20",
      }}
      prices={[rush, rods]}
      cylinders={cylinders}
      busy={false}
      onSave={onSave}
      actions={(dirty) => <span data-testid="dirty">{dirty ? "changed" : "saved"}</span>}
    />,
  );
}

const save = () => userEvent.click(screen.getByRole("button", { name: "Save lines" }));

describe("the lines form of a draft quote or invoice", () => {
  it("totals the lines as typed: 285.00 + 8 × 6.50 = 337.00, tax 20 % = 67.40, total 404.40 (by hand)", () => {
    form();
    expect(screen.getByText("$337.00")).toBeTruthy();
    expect(screen.getByText("$67.40")).toBeTruthy();
    expect(screen.getByText("$404.40")).toBeTruthy();
    expect(screen.getByRole("button", { name: "Save lines" })).toHaveProperty("disabled", true);
  });

  it("moves a line up and sends the lines in the new order, kept lines by id, with the version read", async () => {
    const onSave = vi.fn(async () => null);
    form(onSave);
    await userEvent.click(screen.getByRole("button", { name: "Move line 2 up" }));
    expect(within(screen.getByTestId("line-1")).getByText("MCH-PIS")).toBeTruthy();
    expect(screen.getByTestId("dirty").textContent).toBe("changed");
    await save();
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    expect(onSave).toHaveBeenCalledWith({
      version: 3,
      lines: [
        { lineId: 12, quantity: "8", description: "MCH-PIS work" },
        { lineId: 11, quantity: "1", description: "BAL-I4 work" },
      ],
    });
  });

  it("starts a per-cylinder entry at the job's cylinders (8), an each entry at 1, both editable", async () => {
    const onSave = vi.fn(async () => null);
    form(onSave);
    const picker = screen.getByLabelText("Add a line from the price list");
    await userEvent.selectOptions(picker, "8");
    await userEvent.selectOptions(picker, "7");
    expect(screen.getByLabelText<HTMLInputElement>("Line 3 quantity").value).toBe("8");
    expect(screen.getByLabelText<HTMLInputElement>("Line 4 quantity").value).toBe("1");
    const qty = screen.getByLabelText("Line 4 quantity");
    await userEvent.clear(qty);
    await userEvent.type(qty, "2");
    await userEvent.click(screen.getByRole("button", { name: "Remove line 1" }));
    // 8 × 6.50 + 8 × 9.75 + 2 × 120.00 = 52.00 + 78.00 + 240.00 = 370.00 (by hand)
    expect(screen.getByText("$370.00")).toBeTruthy();
    await save();
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    expect(onSave).toHaveBeenCalledWith({
      version: 3,
      lines: [
        { lineId: 12, quantity: "8", description: "MCH-PIS work" },
        { priceItemId: 8, quantity: "8", description: "MCH-ROD work" },
        { priceItemId: 7, quantity: "2", description: "Rush" },
      ],
    });
  });

  it("takes a one-off line typed by the counter, and refuses it without a description", async () => {
    const onSave = vi.fn(async (_payload: LinesPayload) => null);
    form(onSave);
    await userEvent.click(screen.getByRole("button", { name: "Add a one-off line" }));
    await userEvent.type(screen.getByLabelText("Line 3 price each"), "40.00");
    const qty = screen.getByLabelText("Line 3 quantity");
    await userEvent.clear(qty);
    await userEvent.type(qty, "1.5");
    // 337.00 + 1.5 × 40.00 (60.00) = 397.00 (by hand)
    expect(screen.getByText("$397.00")).toBeTruthy();
    await save();
    expect(await screen.findByTestId("line-3-error")).toHaveProperty(
      "textContent",
      "Describe the work.",
    );
    expect(onSave).not.toHaveBeenCalled();
    await userEvent.type(screen.getByLabelText("Line 3 work"), "Dress keyway by hand");
    await save();
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    expect(onSave.mock.calls[0]![0].lines[2]).toEqual({
      description: "Dress keyway by hand",
      quantity: "1.5",
      unitPrice: "40.00",
    });
  });

  it("shows a one-off line's price as money once the box is left, and as typed while in it", async () => {
    const onSave = vi.fn(async (_payload: LinesPayload) => null);
    form(onSave);
    await userEvent.click(screen.getByRole("button", { name: "Add a one-off line" }));
    await userEvent.type(screen.getByLabelText("Line 3 work"), "Dress keyway by hand");
    const price = screen.getByLabelText<HTMLInputElement>("Line 3 price each");
    await userEvent.type(price, "40");
    expect(price.value).toBe("40");
    await userEvent.tab();
    // 40 in US dollars, as the same list prices beside it are written ($285.00, $6.50)
    expect(price.value).toBe("$40.00");
    // the line's amount beside it: 1 × 40 = 40.00 (by hand)
    expect(within(screen.getByTestId("line-3")).getAllByText("$40.00")).toHaveLength(1);
    await userEvent.click(price);
    expect(price.value).toBe("40");
    await userEvent.tab();
    // a price money would round (40.125 → $40.13) stays as typed, so what is shown is what is charged
    await userEvent.clear(price);
    await userEvent.type(price, "40.125");
    await userEvent.tab();
    expect(price.value).toBe("40.125");
    await userEvent.clear(price);
    await userEvent.type(price, "40");
    await userEvent.tab();
    await save();
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    // what is sent is the figure typed, not the money shown
    expect(onSave.mock.calls[0]![0].lines[2]).toEqual({
      description: "Dress keyway by hand",
      quantity: "1",
      unitPrice: "40",
    });
  });

  it("shows a saved one-off line's price as money, not as stored", () => {
    render(
      <LinesForm
        document={{
          version: 4,
          lines: [{ ...line(13, "X", "1", "40.0000"), priceItemId: null, code: null }],
          currency: "USD",
          taxRate: "0",
        }}
        prices={[]}
        cylinders={8}
        busy={false}
        onSave={async () => null}
        actions={() => null}
      />,
    );
    expect(screen.getByLabelText<HTMLInputElement>("Line 1 price each").value).toBe("$40.00");
  });

  it("marks a quantity that is not a number, shows no totals, and puts a server refusal on its box", async () => {
    const onSave = vi.fn(async () => ({ "lines.0.quantity": "Only 4 cylinders on this job." }));
    form(onSave);
    const qty = screen.getByLabelText("Line 2 quantity");
    await userEvent.clear(qty);
    await userEvent.type(qty, "8O");
    expect(screen.queryByText("$404.40")).toBeNull();
    await save();
    await waitFor(() => expect(qty.getAttribute("aria-invalid")).toBe("true"));
    expect(onSave).not.toHaveBeenCalled();
    await userEvent.clear(qty);
    await userEvent.type(qty, "6");
    await save();
    expect(await screen.findByText("Only 4 cylinders on this job.")).toBeTruthy();
    expect(screen.getByLabelText("Line 1 quantity").getAttribute("aria-invalid")).toBe("true");
  });
});
