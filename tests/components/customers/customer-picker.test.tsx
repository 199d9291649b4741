// @vitest-environment jsdom
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { useState } from "react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { CustomerPicker } from "@/components/customers/customer-picker";
import type { Customer } from "@/db/customers";
import { stubApi } from "../support/stub-api";

const customer = (id: number, name: string): Customer => ({
  id,
  name,
  company: null,
  email: null,
  phone: null,
  address: null,
  notes: null,
  createdAt: "2026-12-01T00:00:00Z",
});
const FOUND = [customer(3, "Orla Penhale"), customer(5, "Orla Quince"), customer(8, "Orlo Teague")];

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function Harness({ onPick, excludeId }: { onPick: (c: Customer) => void; excludeId?: number }) {
  const [search, setSearch] = useState("");
  return (
    <form onSubmit={() => onPick(customer(0, "the form was sent"))}>
      <label htmlFor="pick">Customer</label>
      <CustomerPicker
        id="pick"
        search={search}
        onSearch={setSearch}
        onPick={onPick}
        excludeId={excludeId}
      />
    </form>
  );
}

describe("CustomerPicker", () => {
  it("searches the server, leaves out the excluded customer, wraps with the arrows", async () => {
    const api = stubApi(() => ({ status: 200, body: { customers: FOUND, total: 3 } }));
    const onPick = vi.fn();
    render(<Harness onPick={onPick} excludeId={5} />);
    const user = userEvent.setup();
    const box = screen.getByRole("combobox", { name: "Customer" });
    await user.type(box, " Orl ");
    const options = await screen.findAllByRole("option");
    expect(options.map((o) => o.textContent)).toEqual(["Orla Penhale", "Orlo Teague"]);
    // Asked with what was typed, trimmed, one page of eight.
    expect(api.calls.at(-1)!.url).toBe("/api/customers?pageSize=8&search=Orl");

    await user.keyboard("{ArrowUp}"); // from nothing, up goes to the last
    expect(box.getAttribute("aria-activedescendant")).toBe(options[1]!.id);
    await user.keyboard("{ArrowDown}"); // and down from the last back to the first
    expect(box.getAttribute("aria-activedescendant")).toBe(options[0]!.id);
    await user.keyboard("{Escape}");
    expect(box.getAttribute("aria-activedescendant")).toBeNull();
    // Enter with nothing highlighted and two found picks no one and sends nothing.
    await user.keyboard("{Enter}");
    expect(onPick).not.toHaveBeenCalled();
    await user.keyboard("{ArrowDown}{ArrowDown}{Enter}");
    expect(onPick).toHaveBeenCalledExactlyOnceWith(FOUND[2]);
  });

  it("says so when the search could not be made, instead of showing nothing", async () => {
    stubApi(() => ({
      status: 500,
      body: { error: { code: "internal", message: "Something went wrong." } },
    }));
    render(<Harness onPick={vi.fn()} />);
    await userEvent.setup().type(screen.getByRole("combobox", { name: "Customer" }), "Orla");
    await waitFor(() =>
      expect(screen.getByText("Not searched: Something went wrong.")).toBeTruthy(),
    );
    expect(screen.queryAllByRole("option")).toHaveLength(0);
  });
});
