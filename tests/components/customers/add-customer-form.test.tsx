// @vitest-environment jsdom
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { ActionResult } from "@/lib/http/action-result";
import type { Customer } from "@/db/customers";

// The server action stands in for the server: each test says what it answers.
const answer = vi.fn<(form: FormData) => ActionResult<Customer>>();
vi.mock("@/app/(shop)/customers/actions", () => ({
  createCustomerAction: async (_prev: unknown, form: FormData) => answer(form),
}));

const { AddCustomerForm } = await import("@/components/customers/add-customer-form");

beforeEach(() => {
  answer.mockReset();
});
afterEach(cleanup);

describe("adding a customer", () => {
  it("keeps what was typed when the server refuses, and marks the box it names", async () => {
    answer.mockReturnValue({
      ok: false,
      status: 422,
      message: "Check the marked box.",
      fields: { email: "Enter a valid e-mail address." },
    });
    const user = userEvent.setup();
    render(<AddCustomerForm />);
    await user.type(screen.getByLabelText("Name"), "Oriel Vantongeren");
    await user.type(screen.getByLabelText("Company"), "Vantongeren Marine");
    await user.type(screen.getByLabelText("E-mail"), "oriel@vantongeren");
    await user.type(screen.getByLabelText("Phone"), "555-0190");
    await user.click(screen.getByRole("button", { name: "Add customer" }));

    await screen.findByText("Enter a valid e-mail address.");
    expect(answer).toHaveBeenCalledTimes(1);
    expect(answer.mock.calls[0]![0].get("email")).toBe("oriel@vantongeren");
    expect(screen.getByLabelText("Name")).toHaveProperty("value", "Oriel Vantongeren");
    expect(screen.getByLabelText("Company")).toHaveProperty("value", "Vantongeren Marine");
    expect(screen.getByLabelText("E-mail")).toHaveProperty("value", "oriel@vantongeren");
    expect(screen.getByLabelText("Phone")).toHaveProperty("value", "555-0190");
    const email = screen.getByLabelText("E-mail");
    expect(email.getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByLabelText("Name").getAttribute("aria-invalid")).toBeNull();
    // The box refused takes the cursor, so the machinist can correct it straight away.
    await waitFor(() => expect(document.activeElement).toBe(email));
  });

  it("empties the boxes for the next customer once one is added", async () => {
    answer.mockImplementation((form) => ({
      ok: true,
      message: `${String(form.get("name"))} added.`,
      data: {
        id: 41,
        name: String(form.get("name")),
        company: null,
        email: null,
        phone: null,
        address: null,
        notes: null,
        createdAt: "2026-12-02T08:00:00Z",
      },
    }));
    const user = userEvent.setup();
    render(<AddCustomerForm />);
    await user.type(screen.getByLabelText("Name"), "Oriel Vantongeren");
    await user.click(screen.getByRole("button", { name: "Add customer" }));
    await screen.findByText("Oriel Vantongeren added.");
    expect(screen.getByLabelText("Name")).toHaveProperty("value", "");
  });
});
