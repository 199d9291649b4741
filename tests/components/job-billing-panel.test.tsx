// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { JobBillingPanel } from "@/components/billing/job-billing-panel";
import type { Job } from "@/db/jobs";
import type { InvoiceView, JobBilling, QuoteView } from "@/lib/billing/job-billing";
import { stubApi } from "./support/stub-api";

// A job's billing panel says how the last move went in one place, and the next move replaces it:
// a message from an earlier move never stays on screen beside a later one. The customer reads an
// offered quote as waiting on them, not on "the customer".

vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh: () => undefined }) }));

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const job = { id: 5, number: "J-2026-0005", spec: { cylinders: 8 } } as unknown as Job;

const quote = (status: QuoteView["status"], allowedActions: QuoteView["allowedActions"]) =>
  ({
    id: 3,
    number: "Q-2026-0003",
    jobId: 5,
    status,
    taxRate: "0",
    currency: "USD",
    subtotal: "285.00",
    tax: "0.00",
    total: "285.00",
    lines: [
      {
        id: 31,
        position: 1,
        priceItemId: 1,
        code: "BAL-V8",
        description: "Balance V8 rotating assembly",
        quantity: "1",
        unitPrice: "285.00",
        lineTotal: "285.00",
      },
    ],
    offeredAt: null,
    acceptedAt: status === "accepted" ? "2026-12-01T10:00:00Z" : null,
    acceptedBy: null,
    withdrawnAt: null,
    createdBy: null,
    version: 2,
    createdAt: "2026-12-01T09:00:00Z",
    updatedAt: "2026-12-01T09:00:00Z",
    allowedActions,
  }) as QuoteView;

const invoice = (status: InvoiceView["status"], allowedActions: InvoiceView["allowedActions"]) =>
  ({
    ...quote("accepted", []),
    id: 8,
    number: status === "draft" ? null : "INV-2026-0008",
    jobNumber: job.number,
    customerId: 2,
    customerName: "Test customer",
    quoteId: 3,
    status,
    amountPaid: "0.00",
    issuer: null,
    billTo: null,
    footer: null,
    issuedAt: status === "draft" ? null : "2026-12-02T09:00:00Z",
    paidAt: null,
    voidedAt: null,
    payments: [],
    allowedActions,
  }) as unknown as InvoiceView;

const billing = (over: Partial<JobBilling>): JobBilling => ({
  job,
  quotes: [],
  invoices: [],
  canStart: { quote: false, invoice: false },
  customerView: false,
  prices: [],
  taxRate: "0",
  currency: "USD",
  timeZone: "UTC",
  ...over,
});

function show(initial: JobBilling) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <JobBillingPanel initial={initial} />
    </QueryClientProvider>,
  );
}

describe("the job billing panel's one message", () => {
  it("replaces 'Quote started' with 'Lines changed' once the counter adds a line", async () => {
    let now = billing({ canStart: { quote: true, invoice: false } });
    stubApi((call) => {
      if (call.method === "POST" && call.url === "/api/quotes") {
        now = billing({ quotes: [{ ...quote("draft", ["save-lines", "withdraw"]), lines: [] }] });
        return { status: 201, body: {} };
      }
      return { status: 200, body: now };
    });
    show(now);
    await userEvent.click(screen.getByRole("button", { name: "Start a quote" }));
    await waitFor(() =>
      expect(screen.getByTestId("quote-message").textContent).toBe("Quote started: add its lines."),
    );
    await screen.findByRole("button", { name: "Add a one-off line" });
    await userEvent.click(screen.getByRole("button", { name: "Add a one-off line" }));
    await waitFor(() =>
      expect(screen.getByTestId("quote-message").textContent).toBe(
        "Lines changed: save them before going on.",
      ),
    );
    // Said once, and the earlier message is gone from the whole panel.
    expect(screen.getAllByText("Lines changed: save them before going on.")).toHaveLength(1);
    expect(screen.queryByText("Quote started: add its lines.")).toBeNull();
  });

  it("drops 'Draft invoice made from quote' once that invoice is issued", async () => {
    let now = billing({ quotes: [quote("accepted", ["invoice"])] });
    stubApi((call) => {
      if (call.method === "POST" && call.url === "/api/invoices") {
        now = billing({
          quotes: [quote("accepted", [])],
          invoices: [invoice("draft", ["save-lines", "issue", "delete"])],
        });
        return { status: 201, body: {} };
      }
      if (call.method === "POST" && call.url === "/api/invoices/8/issue") {
        now = billing({
          quotes: [quote("accepted", [])],
          invoices: [invoice("issued", ["record-payment", "void"])],
        });
        return { status: 200, body: {} };
      }
      if (call.url.startsWith("/api/payments/unapplied")) {
        return { status: 200, body: { payments: [] } };
      }
      return { status: 200, body: now };
    });
    show(now);
    await userEvent.click(
      screen.getByRole("button", { name: "Make invoice from quote Q-2026-0003" }),
    );
    await waitFor(() =>
      expect(screen.getByTestId("invoices-message").textContent).toBe(
        "Draft invoice made from quote Q-2026-0003.",
      ),
    );
    await userEvent.click(await screen.findByRole("button", { name: "Issue invoice" }));
    await waitFor(() =>
      expect(screen.getByTestId("invoice-8-message").textContent).toBe("Invoice issued."),
    );
    expect(screen.getByTestId("invoices-message").textContent).toBe("");
    expect(screen.queryByText(/Draft invoice made from quote/)).toBeNull();
  });
});

describe("an offered quote's state", () => {
  it("reads 'Waiting for your go-ahead' to the customer and 'Waiting for the customer' to the shop", () => {
    stubApi(() => ({ status: 200, body: {} }));
    show(billing({ customerView: true, quotes: [quote("offered", ["accept"])] }));
    expect(screen.getByTestId("quote-status").textContent).toBe("Waiting for your go-ahead");
    expect(screen.getByRole("button", { name: "Accept this quote" })).toBeTruthy();
    cleanup();
    show(billing({ quotes: [quote("offered", ["withdraw"])] }));
    expect(
      within(screen.getByRole("region", { name: /Quote/ })).getByTestId("quote-status").textContent,
    ).toBe("Waiting for the customer");
  });
});
