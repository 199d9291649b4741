// @vitest-environment jsdom
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { Customer } from "@/db/customers";
import type { ActionResult } from "@/lib/http/action-result";

const merged = vi.fn<(form: FormData) => ActionResult<undefined>>();
vi.mock("@/app/(shop)/customers/actions", () => ({
  mergeCustomerAction: async (_prev: unknown, form: FormData) => merged(form),
}));

const { MergeCustomerForm } = await import("@/components/customers/merge-customer-form");

const customer = (id: number, name: string, company: string | null = null): Customer => ({
  id,
  name,
  company,
  email: null,
  phone: null,
  address: null,
  notes: null,
  createdAt: "2026-12-01T00:00:00Z",
});

// The shop has more than 500 customers: the kept one is no. 12, its duplicate no. 731.
const KEPT = customer(12, "Ansel Dorrance", "Dorrance Karting");
const DUPLICATE = customer(731, "Ansel Dorance");
const OTHER = customer(402, "Doreen Aldous");

let searches: string[];

beforeEach(() => {
  merged.mockReset();
  searches = [];
  // The server's customer search: every customer whose name starts with what was typed.
  vi.stubGlobal("fetch", async (url: string) => {
    const search = new URL(url, "http://shop.test").searchParams.get("search") ?? "";
    searches.push(search);
    const customers = [KEPT, DUPLICATE, OTHER].filter((c) =>
      c.name.toLowerCase().startsWith(search.toLowerCase()),
    );
    return new Response(JSON.stringify({ customers, total: customers.length }), {
      status: 200,
      headers: { "content-type": "application/json" },
    });
  });
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function hiddenRemoveId(): string | null {
  const box = document.querySelector<HTMLInputElement>('input[type="hidden"][name="removeId"]');
  return box ? box.value : null;
}

describe("merging a duplicate customer", () => {
  it("finds any customer by what is typed, leaves this one out, and picks by keyboard", async () => {
    const user = userEvent.setup();
    render(<MergeCustomerForm keepId={KEPT.id} keepName={KEPT.name} />);
    const box = screen.getByRole("combobox", { name: "Duplicate to merge in and remove" });
    await user.type(box, "Ans");

    const options = await screen.findAllByRole("option");
    expect(options.map((o) => o.textContent)).toEqual([expect.stringContaining("no. 731")]);
    expect(searches.at(-1)).toBe("Ans");

    await user.keyboard("{ArrowDown}");
    expect(box.getAttribute("aria-activedescendant")).toBe(options[0]!.id);
    await user.keyboard("{Enter}");
    // Enter picks the customer; it never sends the merge.
    expect(merged).not.toHaveBeenCalled();
    expect(hiddenRemoveId()).toBe("731");
    expect(screen.getByTestId("merge-chosen").textContent).toContain("Ansel Dorance");

    await user.click(screen.getByRole("checkbox"));
    await user.click(screen.getByRole("button", { name: "Merge customers" }));
    await waitFor(() => expect(merged).toHaveBeenCalledTimes(1));
    const sent = merged.mock.calls[0]![0];
    expect(sent.get("removeId")).toBe("731");
    expect(sent.get("customerId")).toBe("12");
    expect(sent.get("confirm")).toBe("yes");
  });

  it("says when nothing matches, and lets a choice be changed", async () => {
    const user = userEvent.setup();
    render(<MergeCustomerForm keepId={KEPT.id} keepName={KEPT.name} />);
    const box = screen.getByRole("combobox", { name: "Duplicate to merge in and remove" });
    await user.type(box, "Zz");
    expect(await screen.findByText("No other customer matches “Zz”.")).toBeTruthy();

    await user.clear(box);
    await user.type(box, "Dore");
    await user.click(await screen.findByRole("option", { name: /Doreen Aldous/ }));
    expect(hiddenRemoveId()).toBe("402");
    await user.click(screen.getByRole("button", { name: "Change" }));
    expect(hiddenRemoveId()).toBeNull();
    expect(screen.getByRole("combobox", { name: "Duplicate to merge in and remove" })).toBe(
      document.activeElement,
    );
  });

  it("marks the search box when the server asks for a customer", async () => {
    merged.mockReturnValue({
      ok: false,
      status: 422,
      message: "Check the marked box.",
      fields: { removeId: "Choose the customer to merge into this one." },
    });
    const user = userEvent.setup();
    render(<MergeCustomerForm keepId={KEPT.id} keepName={KEPT.name} />);
    await user.click(screen.getByRole("checkbox"));
    await user.click(screen.getByRole("button", { name: "Merge customers" }));
    expect(await screen.findByText("Choose the customer to merge into this one.")).toBeTruthy();
    const box = screen.getByRole("combobox", { name: "Duplicate to merge in and remove" });
    expect(box.getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByRole("checkbox")).toHaveProperty("checked", true);
  });
});
