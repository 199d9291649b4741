// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { describeChange } from "@/components/jobs/change-sentences";
import { JobChanges } from "@/components/jobs/job-changes";
import type { JobChange } from "@/db/audit";
import { stubApi } from "./support/stub-api";

// The job page's change list shows the newest 100 and fetches the earlier ones a page at a time
// from GET /api/jobs/:id/history?before=<the last one shown>, so a first weigh-in under many
// build-record saves can still be read.

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const weighIn = (id: number, cylinder: number, grams: string): JobChange => ({
  id,
  at: "2026-12-01T09:00:00.000Z",
  who: "Machinist",
  action: "weigh",
  entity: "part_weight",
  subject: `${cylinder}:piston:initial`,
  before: null,
  after: [grams],
});

/** The sentence the list shows for an entry (the same words the job page uses). */
const sentence = (c: JobChange) => `${describeChange(c, "g").join("; ")}.`;

function show(changes: JobChange[], earlier: number | null) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <JobChanges jobId={7} changes={changes} earlier={earlier} unit="g" timeZone="UTC" />
    </QueryClientProvider>,
  );
}

const rows = () => within(screen.getByTestId("job-changes")).getAllByRole("listitem");

describe("the job's change list, page by page", () => {
  it("shows earlier changes from the last one shown, until there are none", async () => {
    const newest = [weighIn(300, 1, "512.4"), weighIn(299, 2, "513.0")];
    const older = [weighIn(12, 3, "511.8")];
    const oldest = [weighIn(3, 4, "510.9")];
    const api = stubApi((call) =>
      call.url.endsWith("before=299")
        ? { status: 200, body: { changes: older, earlier: 12 } }
        : { status: 200, body: { changes: oldest, earlier: null } },
    );
    show(newest, 299);
    expect(rows()).toHaveLength(2);
    await userEvent.click(screen.getByRole("button", { name: "Show earlier changes" }));
    expect(await screen.findByText(sentence(older[0]!))).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Show earlier changes" }));
    expect(await screen.findByText(sentence(oldest[0]!))).toBeTruthy();
    expect(rows().map((r) => r.textContent)).toEqual(
      [...newest, ...older, ...oldest].map((c) => expect.stringContaining(sentence(c))),
    );
    expect(api.calls.map((c) => `${c.method} ${c.url}`)).toEqual([
      "GET /api/jobs/7/history?before=299",
      "GET /api/jobs/7/history?before=12",
    ]);
    expect(screen.queryByRole("button", { name: "Show earlier changes" })).toBeNull();
  });

  it("offers no button when the first page is the whole history", () => {
    const api = stubApi(() => ({ status: 500, body: {} }));
    show([weighIn(5, 1, "512.4")], null);
    expect(rows()).toHaveLength(1);
    expect(screen.queryByRole("button", { name: "Show earlier changes" })).toBeNull();
    expect(api.calls).toEqual([]);
  });

  it("says so when the earlier changes cannot be loaded, and keeps the button", async () => {
    stubApi(() => ({
      status: 403,
      body: { error: { code: "forbidden", message: "Only the shop can read this." } },
    }));
    show([weighIn(300, 1, "512.4")], 300);
    await userEvent.click(screen.getByRole("button", { name: "Show earlier changes" }));
    expect((await screen.findByRole("alert")).textContent).toContain(
      "Earlier changes could not be loaded: Only the shop can read this.",
    );
    expect(screen.getByRole("button", { name: "Show earlier changes" })).toBeTruthy();
    expect(rows()).toHaveLength(1);
  });
});
