// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { renderToStaticMarkup } from "react-dom/server";
import { afterEach, describe, expect, it, vi } from "vitest";
import { SignInNotices } from "@/components/auth/sign-in-notices";
import { JobChanges } from "@/components/jobs/job-changes";
import { InviteCustomerButton } from "@/components/mail/invite-customer-button";
import type { JobChange } from "@/db/audit";

// Every time here is 01:30 UTC on 3 Dec 2026: in Denver (MST, UTC−7 in winter) that is 18:30 on
// 2 Dec, worked by hand (01:30 − 7 h, the day before). Shown in UTC it would read the 3rd.
const EVENING = "2026-12-03T01:30:00.000Z";

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe("dates on the shop's clock", () => {
  it("the job's changes", () => {
    const change: JobChange = {
      id: 1,
      at: EVENING,
      who: "Counter",
      action: "weigh",
      entity: "part_weight",
      subject: "3:piston:initial",
      before: null,
      after: ["512.4"],
    };
    const html = renderToStaticMarkup(
      <JobChanges changes={[change]} unit="g" timeZone="America/Denver" />,
    );
    expect(html).toContain("2026-12-02 18:30 MST");
    expect(html).not.toContain("2026-12-03");
  });

  it("the owner's sign-in notices", () => {
    const html = renderToStaticMarkup(
      <SignInNotices
        notices={[
          { email: "x@example.test", address: null, failures: 5, waitUntil: EVENING, at: EVENING },
        ]}
        timeZone="America/Denver"
      />,
    );
    expect(html).toContain("2026-12-02 18:30 MST");
  });

  it("the end of an invite link", async () => {
    vi.stubGlobal("fetch", async () =>
      Response.json(
        {
          invite: { email: "wren@example.test", expiresAt: EVENING },
          mail: { status: "sent", lastError: null },
        },
        { status: 201 },
      ),
    );
    const user = userEvent.setup();
    render(
      <QueryClientProvider client={new QueryClient()}>
        <InviteCustomerButton customerId={4} email="wren@example.test" timeZone="America/Denver" />
      </QueryClientProvider>,
    );
    await user.click(screen.getByRole("button", { name: "Invite to sign in" }));
    await user.click(screen.getByRole("button", { name: "Send invite" }));
    await waitFor(() =>
      expect(screen.getByText(/The link works until 2026-12-02 18:30 MST\./)).toBeTruthy(),
    );
  });
});
