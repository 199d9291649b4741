// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { BookingForm } from "@/components/jobs/booking-form";

const push = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push, refresh: () => undefined }) }));

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let answer: (call: Call) => { status: number; body: unknown };

const FOUND = [
  { id: 4, name: "Ilse Marrow", company: "Marrow Racing", email: null },
  { id: 7, name: "Ilse Quell", company: null, email: "ilse@example.test" },
];

beforeEach(() => {
  calls = [];
  push.mockReset();
  answer = (call) =>
    call.url.startsWith("/api/customers")
      ? { status: 200, body: { customers: FOUND, total: 2 } }
      : { status: 201, body: { job: { id: 31 } } };
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    const { status, body } = answer(call);
    return new Response(JSON.stringify(body), {
      status,
      headers: { "content-type": "application/json" },
    });
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderForm() {
  render(
    <QueryClientProvider client={new QueryClient()}>
      <BookingForm />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

const posts = () => calls.filter((c) => c.method === "POST");
const bookButton = () => screen.getByRole("button", { name: "Book the job in" });

describe("the booking form", () => {
  it("marks the bore typed with letter O and sends nothing", async () => {
    const user = renderForm();
    await user.click(screen.getByRole("button", { name: "New customer" }));
    await user.type(screen.getByLabelText("Name"), "Ossian Brae");
    await user.type(screen.getByLabelText("Description"), "Cross-plane V8");
    await user.type(screen.getByLabelText("Bore"), "4.O3O");
    await user.click(bookButton());
    await waitFor(() =>
      expect(screen.getByLabelText("Bore").getAttribute("aria-invalid")).toBe("true"),
    );
    expect(screen.getByText(/^Bore: enter a number like/)).toBeTruthy();
    expect(screen.getByTestId("booking-message").textContent).toMatch(/^Not booked: one box needs/);
    expect(posts()).toHaveLength(0);

    // Corrected, the customer goes with the job in one request (no separate customer save).
    await user.clear(screen.getByLabelText("Bore"));
    await user.type(screen.getByLabelText("Bore"), "4.030");
    await user.click(bookButton());
    await waitFor(() => expect(posts()).toHaveLength(1));
    expect(posts()[0]!.url).toBe("/api/jobs");
    expect(posts()[0]!.body).toMatchObject({
      customer: { name: "Ossian Brae" },
      spec: { bore: "4.030" },
    });
    await waitFor(() => expect(push).toHaveBeenCalledWith("/jobs/31"));
  });

  it("asks for a customer when none was chosen, not for a new customer's name", async () => {
    const user = renderForm();
    await user.type(screen.getByLabelText("Description"), "Inline four");
    await user.click(bookButton());
    await waitFor(() =>
      expect(
        screen.getByText("Customer: choose one from the search, or add a new one."),
      ).toBeTruthy(),
    );
    expect(screen.queryByText(/new customer needs a name/i)).toBeNull();
    expect(posts()).toHaveLength(0);
  });

  it("refuses a quantity in letters beside its part", async () => {
    const user = renderForm();
    await user.click(screen.getByRole("button", { name: "New customer" }));
    await user.type(screen.getByLabelText("Name"), "Ossian Brae");
    await user.type(screen.getByLabelText("Description"), "Inline four");
    await user.click(screen.getByLabelText("Pistons", { exact: true }));
    await user.type(screen.getByLabelText("Pistons quantity"), "abc");
    await user.click(bookButton());
    await waitFor(() =>
      expect(screen.getByText("Pistons: a whole number from 1 to 64, like 8.")).toBeTruthy(),
    );
    expect(posts()).toHaveLength(0);
  });

  it("picks a customer from the search with the arrow keys and Enter", async () => {
    const user = renderForm();
    const search = screen.getByRole("combobox", { name: /Find by name/ });
    await user.type(search, "Ilse");
    const list = screen.getByRole("listbox", { name: "Customers found" });
    const options = () => within(list).getAllByRole("option");
    await waitFor(() => expect(options()).toHaveLength(2));
    await user.keyboard("{ArrowDown}{ArrowDown}");
    expect(options()[1]!.getAttribute("aria-selected")).toBe("true");
    expect(search.getAttribute("aria-activedescendant")).toBe(options()[1]!.id);
    await user.keyboard("{Enter}");
    expect(screen.getByTestId("chosen-customer").textContent).toContain("Ilse Quell");
    expect(posts()).toHaveLength(0); // Enter picked; it did not book

    await user.type(screen.getByLabelText("Description"), "Inline four");
    await user.click(bookButton());
    await waitFor(() => expect(posts()).toHaveLength(1));
    expect(posts()[0]!.body).toMatchObject({ customerId: 7 });
    expect(posts()[0]!.body).not.toHaveProperty("customer");
  });

  it("asks before booking with a promised date already past", async () => {
    const user = renderForm();
    await user.click(screen.getByRole("button", { name: "New customer" }));
    await user.type(screen.getByLabelText("Name"), "Ossian Brae");
    await user.type(screen.getByLabelText("Description"), "Inline four");
    await user.type(screen.getByLabelText("Promised for"), "2020-01-15");
    await user.click(bookButton());
    await waitFor(() => expect(screen.getByTestId("past-date")).toBeTruthy());
    expect(posts()).toHaveLength(0);
    await user.click(screen.getByRole("button", { name: "Book with 2020-01-15" }));
    await waitFor(() => expect(posts()).toHaveLength(1));
    expect(posts()[0]!.body).toMatchObject({ spec: { promisedDate: "2020-01-15" } });
  });

  it("puts the server's refusal beside the part it names", async () => {
    answer = (call) =>
      call.method === "POST"
        ? {
            status: 422,
            body: {
              error: {
                code: "invalid_input",
                message: "Some fields need attention.",
                fields: {
                  "spec.items.0.quantity": "Quantity: a whole number from 1 to 64, like 8.",
                },
              },
            },
          }
        : { status: 200, body: { customers: [] } };
    const user = renderForm();
    await user.click(screen.getByRole("button", { name: "New customer" }));
    await user.type(screen.getByLabelText("Name"), "Ossian Brae");
    await user.type(screen.getByLabelText("Description"), "Inline four");
    await user.click(screen.getByLabelText("Con-rods", { exact: true }));
    await user.click(bookButton());
    await waitFor(() =>
      expect(screen.getByLabelText("Con-rods quantity").getAttribute("aria-invalid")).toBe("true"),
    );
    expect(screen.getByTestId("booking-message").textContent).toMatch(/^Not booked: one box/);
  });
});
