// @vitest-environment jsdom
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { UnappliedPaymentBanner } from "@/components/payments/unapplied-payment-banner";
import { UnappliedPaymentsList } from "@/components/payments/unapplied-payments-list";
import type { UnappliedPaymentListed } from "@/db/payments";

const refresh = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh }) }));

const kept: UnappliedPaymentListed = {
  id: 7,
  eventId: "evt_test_7",
  sessionId: "cs_test_7",
  invoiceId: 12,
  amount: "178.61",
  currency: "USD",
  reason: "over-owed",
  reference: "pi_test_7",
  status: "open",
  note: null,
  paymentId: null,
  resolvedBy: null,
  resolvedAt: null,
  receivedAt: "2026-12-02T15:04:00.000Z",
  version: 1,
  invoiceNumber: "INV-2026-0012",
  jobId: 3,
  resolvedByName: null,
};

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let open: UnappliedPaymentListed[];
/** What the apply route answers: the refusal the server gives for 178.61 where 168.61 is owed. */
const refusal = {
  error: {
    code: "does_not_fit",
    message: "$178.61 is more than the $168.61 still owed on INV-2026-0012: refund it.",
  },
};

beforeEach(() => {
  calls = [];
  open = [kept];
  refresh.mockClear();
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    if (call.method === "GET") return Response.json({ payments: open });
    if (url.endsWith("/apply")) return Response.json(refusal, { status: 409 });
    open = [];
    return Response.json({ item: { ...kept, status: "refunded", version: 2 } });
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe("the banner on an invoice", () => {
  it("says in words that a payment was received online and not applied, and why", async () => {
    render(<UnappliedPaymentBanner invoiceId={12} />);
    const banner = await screen.findByRole("alert");
    expect(banner.textContent).toContain(
      "A payment of $178.61 was received online and not applied: refund it or apply it.",
    );
    expect(banner.textContent).toContain("It was more than was still owed when it arrived.");
    expect(banner.textContent).toContain("pi_test_7");
    expect(calls[0]).toMatchObject({
      method: "GET",
      url: "/api/payments/unapplied?invoiceId=12&status=open",
    });
  });

  it("shows nothing when every online payment was applied", async () => {
    open = [];
    const { container } = render(<UnappliedPaymentBanner invoiceId={12} />);
    await waitFor(() => expect(calls).toHaveLength(1));
    expect(container.innerHTML).toBe("");
  });

  it("shows nothing to someone who may not settle payments (the API answers 403)", async () => {
    vi.stubGlobal("fetch", async () =>
      Response.json({ error: { code: "forbidden", message: "Not for you." } }, { status: 403 }),
    );
    const { container } = render(<UnappliedPaymentBanner invoiceId={12} />);
    await waitFor(() => expect(container.innerHTML).toBe(""));
    await new Promise((r) => setTimeout(r, 20));
    expect(container.innerHTML).toBe("");
  });

  it("shows the server's reason when Apply as payment is refused, and changes nothing", async () => {
    render(<UnappliedPaymentBanner invoiceId={12} />);
    await userEvent.click(await screen.findByRole("button", { name: "Apply as payment" }));
    expect(
      await screen.findByText(
        "$178.61 is more than the $168.61 still owed on INV-2026-0012: refund it.",
      ),
    ).toBeTruthy();
    expect(calls.at(-1)).toMatchObject({
      method: "POST",
      url: "/api/payments/unapplied/7/apply",
      body: { version: 1 },
    });
    expect(screen.getByRole("alert")).toBeTruthy();
    expect(refresh).not.toHaveBeenCalled();
  });

  it("marks it refunded with the note typed, then goes away and reloads the invoice", async () => {
    const onChanged = vi.fn();
    render(<UnappliedPaymentBanner invoiceId={12} onChanged={onChanged} />);
    await userEvent.click(await screen.findByRole("button", { name: "Mark refunded" }));
    await userEvent.type(
      screen.getByLabelText("What was done (refund reference, or why)"),
      "Refunded, ref re_test_7",
    );
    await userEvent.click(screen.getByRole("button", { name: "Save as refunded" }));
    await waitFor(() => expect(screen.queryByRole("alert")).toBeNull());
    expect(calls.find((c) => c.url.endsWith("/refund"))).toMatchObject({
      body: { version: 1, note: "Refunded, ref re_test_7" },
    });
    expect(screen.getByTestId("unapplied-payment-message").textContent).toContain(
      "Marked refunded.",
    );
    expect(onChanged).toHaveBeenCalledTimes(1);
  });
});

describe("the list of payments to reconcile", () => {
  it("lists each with its invoice, amount, reason and the shop's time; a settled one without actions", () => {
    const refunded: UnappliedPaymentListed = {
      ...kept,
      id: 8,
      invoiceId: null,
      invoiceNumber: null,
      jobId: null,
      reason: "unknown-session",
      status: "refunded",
      note: "Sent back, ref re_test_8",
      resolvedByName: "Dana Counter",
      resolvedAt: "2026-12-02T16:00:00.000Z",
    };
    render(<UnappliedPaymentsList items={[kept, refunded]} timeZone="America/Chicago" />);
    const first = screen.getByTestId("unapplied-payment-7");
    expect(first.textContent).toContain("$178.61");
    expect(screen.getByRole("link", { name: "INV-2026-0012" }).getAttribute("href")).toBe(
      "/jobs/3/billing",
    );
    expect(first.textContent).toContain("To reconcile");
    // 15:04 UTC is 09:04 in Chicago on 2 December (UTC−6, standard time).
    expect(first.textContent).toContain("09:04");
    const second = screen.getByTestId("unapplied-payment-8");
    expect(second.textContent).toContain("for no invoice of ours");
    expect(second.textContent).toContain("Marked refunded by Dana Counter");
    expect(second.textContent).toContain("Sent back, ref re_test_8");
    expect(second.querySelector("button")).toBeNull();
  });
});

describe("refusals on the actions", () => {
  it("shows the shared changed-elsewhere notice, not the raw 409 text, when someone settled it first", async () => {
    vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
      calls.push({ method: init.method ?? "GET", url, body: null });
      if ((init.method ?? "GET") === "GET") return Response.json({ payments: open });
      return Response.json(
        { error: { code: "stale_write", message: "payment to reconcile changed (version 2)" } },
        { status: 409 },
      );
    });
    render(<UnappliedPaymentBanner invoiceId={12} />);
    await userEvent.click(await screen.findByRole("button", { name: "Apply as payment" }));
    const notice = await screen.findByTestId("changed-elsewhere");
    expect(notice.textContent).toContain("someone else changed this payment");
    expect(screen.queryByText(/version 2/)).toBeNull();
    const reads = calls.filter((c) => c.method === "GET").length;
    await userEvent.click(screen.getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(calls.filter((c) => c.method === "GET").length).toBe(reads + 1));
    expect(refresh).toHaveBeenCalled();
  });

  it("says the server could not be reached in the API client's own words", async () => {
    vi.stubGlobal("fetch", async (_url: string, init: RequestInit = {}) => {
      if ((init.method ?? "GET") === "GET") return Response.json({ payments: open });
      throw new TypeError("Failed to fetch");
    });
    render(<UnappliedPaymentBanner invoiceId={12} />);
    await userEvent.click(await screen.findByRole("button", { name: "Apply as payment" }));
    expect(
      await screen.findByText(
        "The server could not be reached. Check the connection and try again.",
      ),
    ).toBeTruthy();
  });
});
