// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { Bobweights } from "@/components/workshop/bobweights";
import { DEFAULT_SPEC, type Job, type JobSpec } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import type { Workshop } from "@/lib/workshop/load";
import { buildWorkshopPlan } from "@/lib/workshop/plan";

afterEach(cleanup);

/** What a reader sees in an element, runs of white space made single spaces. */
const text = (el: HTMLElement) => (el.textContent ?? "").replace(/\s+/g, " ");

/*
 * The cross-plane V8 worked by hand in tests/lib/balance/bobweight.test.ts (invented weights,
 * g): wrist pin 120.0, retainers 2.0, rings 40.0, small end 160.0, big end 440.0, bearing 50.0,
 * pistons 500.0/500.2/500.4/500.0/500.1/500.1/500.3/500.3, oil 2.5 g per rod, 50 %:
 *   pins 1807.1, 1807.2, 1807.1, 1807.3; to build: 7228.7 ÷ 4 = 1807.175, shown one decimal
 *   finer than the 0.1 g scale, halves away from zero: 1807.18; spread 0.2 > 0.1.
 */
const PISTONS = ["500.0", "500.2", "500.4", "500.0", "500.1", "500.1", "500.3", "500.3"];
const SAME: Partial<Record<PartKind, string>> = {
  wristPin: "120.0",
  retainers: "2.0",
  rings: "40.0",
  smallEnd: "160.0",
  bigEnd: "440.0",
  bearing: "50.0",
};

function v8Weights(): PartWeight[] {
  const weight = (cylinder: number, kind: PartKind, value: string): PartWeight => ({
    cylinder,
    kind,
    phase: "initial",
    readings: [value],
    confirmedOutlier: false,
    version: 1,
    updatedAt: "2026-12-02T00:00:00Z",
  });
  return PISTONS.flatMap((piston, i) => [
    weight(i + 1, "piston", piston),
    ...Object.entries(SAME).map(([kind, value]) => weight(i + 1, kind as PartKind, value)),
  ]);
}

function renderFor(spec: Partial<JobSpec>) {
  const job = {
    id: 7,
    number: "2026-0007",
    customerId: 1,
    customerName: "Invented customer",
    engine: "invented V8",
    status: "balancing",
    notes: null,
    version: 1,
    createdAt: "2026-12-01T00:00:00Z",
    updatedAt: "2026-12-01T00:00:00Z",
    spec: { ...DEFAULT_SPEC, layout: "v8-cross-plane", cylinders: 8, ...spec },
  } as Job;
  const weights = v8Weights();
  const workshop = {
    job,
    weights,
    targets: [],
    rotating: [],
    plan: buildWorkshopPlan(job, weights, []),
    lastPairing: null,
    outlierPercent: "5",
  } as unknown as Workshop;
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <Bobweights jobId={job.id} initial={workshop} />
    </QueryClientProvider>,
  );
  return workshop;
}

describe("the bobweights screen", () => {
  it("shows the figure to build to, each pin's figure and a warning for the spread (hand-worked)", () => {
    const workshop = renderFor({ oilAllowancePerRod: "2.5" });
    expect(workshop.plan.finished?.buildTo[0]?.mass).toBe("1807.175");
    expect(text(screen.getByTestId("build-to"))).toContain("1807.18");
    expect(text(screen.getByTestId("build-to-spread"))).toContain(
      "range from 1807.10 to 1807.30 g, a spread of 0.20 g",
    );
    expect(text(screen.getByTestId("build-to-warning"))).toContain(
      "The pins differ by 0.20 g, more than the scale resolution (0.1 g)",
    );
    const pins = within(screen.getByTestId("bobweights")).getAllByRole("listitem");
    expect(pins.map((p) => p.textContent?.match(/\d{4}\.\d{2}/)?.[0])).toEqual([
      "1807.10",
      "1807.20",
      "1807.10",
      "1807.30",
    ]);
    expect(text(screen.getByTestId("bobweight-basis"))).toContain(
      "oil allowance 2.50 g per rod, 5.00 g per pin",
    );
    expect(screen.queryByTestId("no-oil-allowance")).toBeNull();
  });

  it("warns loudly when no oil allowance is included", () => {
    renderFor({ oilAllowance: "0", oilAllowancePerRod: null });
    expect(text(screen.getByTestId("no-oil-allowance"))).toContain("No oil allowance is included");
  });

  it("says an older job's allowance is per crankpin", () => {
    renderFor({ oilAllowance: "5", oilAllowancePerRod: null });
    expect(text(screen.getByTestId("bobweight-basis"))).toContain(
      "oil allowance 5.00 g per crankpin (this job was set up per crankpin)",
    );
    // 5 per pin = 2.5 per rod on two-rod pins: the same figure to build to.
    expect(text(screen.getByTestId("build-to"))).toContain("1807.18");
  });

  it("keeps 'No bobweight needed' for a layout spun bare", () => {
    renderFor({ layout: "v8-flat-plane", oilAllowancePerRod: "2" });
    expect(text(screen.getByTestId("no-bobweight"))).toContain("No bobweight needed");
    expect(screen.queryByTestId("build-to")).toBeNull();
  });
});
