// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { JobsTable } from "@/components/jobs/jobs-table";
import type { Job } from "@/db/jobs";

afterEach(cleanup);

// Changed at 01:30 UTC on 3 Dec 2026: in Denver (MST, UTC−7) that is 18:30 on 2 Dec, worked by
// hand (01:30 − 7 h, the day before); in Lisbon (WET, UTC+0 in December) still 3 Dec.
const job = {
  id: 11,
  number: "J-0011",
  customerId: 4,
  customerName: "Ansel Dorrance",
  engine: "Small-block V8 with a long-stroke crank",
  status: "booked",
  notes: null,
  version: 1,
  createdAt: "2026-12-01T15:00:00.000Z",
  updatedAt: "2026-12-03T01:30:00.000Z",
  spec: { promisedDate: "2026-12-09" },
} as unknown as Job;

function renderTable(timeZone: string) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  return render(
    <QueryClientProvider client={client}>
      <JobsTable
        initial={{ jobs: [job], total: 1, page: 1, pageSize: 25 }}
        customerView={false}
        timeZone={timeZone}
      />
    </QueryClientProvider>,
  );
}

describe("the jobs table", () => {
  it("shows the day a job changed on the shop's calendar west of Greenwich", () => {
    const view = renderTable("America/Denver");
    const table = view.getByTestId("jobs-table");
    expect(within(table).getByText("2026-12-02")).toBeTruthy();
    expect(within(table).queryByText("2026-12-03")).toBeNull();
  });

  it("shows the UTC day for a shop on Greenwich time", () => {
    const view = renderTable("Europe/Lisbon");
    expect(within(view.getByTestId("jobs-table")).getByText("2026-12-03")).toBeTruthy();
  });

  it("has a card per job for phone width, each cell under its heading, and keeps the engine on its own lines", () => {
    const view = renderTable("America/Denver");
    const cards = view.getByTestId("job-cards");
    expect(cards.className).toContain("sm:hidden");
    const wide = view.getByTestId("jobs-table").parentElement!.className.split(" ");
    expect(wide).toEqual(expect.arrayContaining(["hidden", "sm:block"]));
    const card = within(cards).getAllByRole("listitem")[0]!;
    const terms = within(card)
      .getAllByRole("term")
      .map((t) => t.textContent);
    expect(terms).toEqual(["Job", "Customer", "Engine", "State", "Promised", "Updated"]);
    expect(within(card).getByText("Small-block V8 with a long-stroke crank")).toBeTruthy();
    expect(within(card).getByRole("link", { name: "J-0011" }).getAttribute("href")).toBe(
      "/jobs/11",
    );
    const engineCell = within(view.getByTestId("jobs-table")).getByText(
      "Small-block V8 with a long-stroke crank",
    );
    expect(engineCell.className).toContain("min-w-48");
  });
});
