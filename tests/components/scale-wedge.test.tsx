// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { WeighGrid } from "@/components/workshop/weigh-grid";
import type { Workshop } from "@/lib/workshop/load";
import { emptyPlan, emptyTwinWorkshop, twinJob } from "./support/twin-workshop";

const job = twinJob;
const initial = emptyTwinWorkshop;

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let answer: (call: Call) => { status: number; body: unknown };

beforeEach(() => {
  calls = [];
  answer = (call) => ({
    status: 200,
    body: { weight: { ...call.body, version: 1, updatedAt: "now" }, plan: emptyPlan },
  });
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

function renderGrid(start: Workshop = initial) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  render(
    <QueryClientProvider client={client}>
      <WeighGrid jobId={job.id} initial={start} canEdit />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

const cell = (cyl: number, label: string) => screen.getByLabelText(`Cylinder ${cyl} ${label}, g`);
const puts = () => calls.filter((c) => c.method === "PUT").map((c) => c.body);

describe("a keyboard-wedge scale typing into the weigh-in grid", () => {
  it("saves what it types (sign, spaces, unit, Enter) as the reading", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("+   498.6 g{Enter}");
    expect(document.activeElement).toBe(cell(2, "Piston"));
    await waitFor(() =>
      expect(puts()).toEqual([
        { cylinder: 1, kind: "piston", readings: ["498.6"], version: 0, phase: "initial" },
      ]),
    );
  });

  it("converts a reading in ounces for a job in grams", async () => {
    // By hand: 17.59 × 28.349523125 = 498.66811… g (NIST Handbook 44 App. C); the scale's step
    // 0.01 oz is 0.283 g, a tenth of it 0.028 g keeps two decimals → 498.67 g.
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("+  17.59 oz{Enter}");
    await waitFor(() => expect(puts()[0]).toMatchObject({ readings: ["498.67"] }));
  });

  it("refuses a count, naming it, and sends nothing", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("+  12 pcs{Enter}");
    expect(document.activeElement).toBe(cell(1, "Piston"));
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain(
        'The scale sent "pcs", not a weight: set it to weigh in grams.',
      ),
    );
    expect(puts()).toHaveLength(0);
  });
});
