// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { CardStaleBanner } from "@/components/cards/card-stale-banner";
import type { CardStatus } from "@/lib/cards/status";

const stale: CardStatus = {
  current: { revision: 1, issuedAt: "2026-12-01T09:30:00.000Z", verificationCode: "7KQ2M-9XW4D" },
  nextRevision: 2,
  changed: ["weights"],
  stale: true,
  message: "Changed since revision 1 was issued: weights.",
  blocker: null,
  exceptions: [],
};
const matching: CardStatus = {
  ...stale,
  stale: false,
  changed: [],
  message: null,
  nextRevision: 3,
};

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let issued: boolean;

beforeEach(() => {
  calls = [];
  issued = false;
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    if (call.method === "POST") {
      issued = true;
      const card = { revision: 2, verificationCode: "ABCDE-12345" };
      return Response.json({ card }, { status: 201 });
    }
    if (url.endsWith("/cards/status")) return Response.json({ status: issued ? matching : stale });
    return Response.json({ cards: [] });
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderBanner(initial: CardStatus, canIssue = true, timeZone = "UTC") {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  render(
    <QueryClientProvider client={client}>
      <CardStaleBanner
        jobId={7}
        initial={initial}
        canIssue={canIssue}
        defaultPageSize="A4"
        timeZone={timeZone}
      />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

describe("the card-no-longer-matches banner", () => {
  it("gives the time the card was issued on the shop's clock, west of Greenwich", () => {
    // 01:30 UTC on 3 Dec is 18:30 on 2 Dec in Denver (MST, UTC−7), worked by hand.
    const evening = {
      ...stale,
      current: { ...stale.current!, issuedAt: "2026-12-03T01:30:00.000Z" },
    };
    renderBanner(evening, false, "America/Denver");
    const banner = screen.getByTestId("card-stale-banner");
    expect(banner.textContent).toContain("issued 2026-12-02 18:30 MST");
    expect(banner.textContent).not.toContain("2026-12-03");
  });

  it("says what changed and re-issues in one step, then goes away", async () => {
    const user = renderBanner(stale);
    const banner = screen.getByTestId("card-stale-banner");
    expect(banner.textContent).toContain("The balance card no longer matches this job");
    expect(banner.textContent).toContain("Changed since revision 1 was issued: weights.");
    await user.click(screen.getByRole("button", { name: "Issue balance card (revision 2)" }));
    await waitFor(() => expect(screen.queryByTestId("card-stale-banner")).toBeNull());
    expect(screen.getByTestId("card-stale-done").textContent).toContain(
      "Revision 2 issued, verification code ABCDE-12345",
    );
    expect(calls.find((c) => c.method === "POST")!.body).toEqual({ pageSize: "A4" });
  });

  it("shows nothing while the card matches the job", () => {
    renderBanner(matching);
    expect(screen.queryByTestId("card-stale-banner")).toBeNull();
  });

  it("asks for the override and a reason before re-issuing a set with exceptions", async () => {
    const user = renderBanner({
      ...stale,
      exceptions: ["cylinder 3 piston 0.80 g heavy, over the band"],
    });
    const button = screen.getByRole("button", { name: "Issue balance card (revision 2)" });
    expect(button).toHaveProperty("disabled", true);
    expect(screen.getByTestId("stale-card-exceptions").textContent).toContain(
      "cylinder 3 piston 0.80 g heavy, over the band",
    );
    await user.click(screen.getByLabelText("Issue with these parts"));
    await user.type(screen.getByLabelText("Reason (printed on the card)"), "Customer's choice");
    expect(button).toHaveProperty("disabled", false);
    await user.click(button);
    await waitFor(() => expect(calls.some((c) => c.method === "POST")).toBe(true));
    expect(calls.find((c) => c.method === "POST")!.body).toEqual({
      pageSize: "A4",
      override: true,
      overrideReason: "Customer's choice",
    });
  });

  it("shows why a new revision cannot be issued yet, and the counter gets no button", () => {
    renderBanner({
      ...stale,
      blocker: "A card cannot carry a weight that is held on the weigh-in",
    });
    expect(screen.getByTestId("stale-card-blocker").textContent).toContain("held on the weigh-in");
    cleanup();
    renderBanner(stale, false);
    expect(screen.queryByRole("button", { name: /Issue balance card/ })).toBeNull();
  });
});
