// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { RotatingParts } from "@/components/workshop/rotating-parts";
import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { RotatingRecordInput } from "@/lib/validation/workshop";
import type { Workshop } from "@/lib/workshop/load";
import { holeRequestSchema } from "@/lib/validation/balance";
import { workOutHole } from "@/lib/workshop/hole-helpers";
import { checkRotatingRecord } from "@/lib/workshop/rotating";

const job: Job = {
  id: 9,
  number: "2026-0009",
  customerId: 1,
  customerName: "Invented customer",
  engine: "invented four",
  status: "balancing",
  notes: null,
  version: 1,
  createdAt: "2026-12-01T00:00:00Z",
  updatedAt: "2026-12-01T00:00:00Z",
  spec: { ...DEFAULT_SPEC, layout: "inline-4", cylinders: 4, maxRpm: 6000 },
} as Job;

const emptyPlan = {
  complete: false,
  missing: [],
  removal: null,
  finished: null,
  reweighed: 0,
  drill: {},
  pairing: null,
  error: null,
} as unknown as Workshop["plan"];

function workshopWith(
  records: { part: "flywheel" | "crankshaft"; data: RotatingRecordInput }[],
  forJob: Job = job,
) {
  const rotating = records.map((r) => {
    const record = { ...r, version: 1, updatedAt: "2026-12-02T00:00:00Z" };
    return { ...record, check: checkRotatingRecord(record) };
  });
  return {
    job: forJob,
    weights: [],
    targets: [],
    rotating,
    plan: emptyPlan,
    lastPairing: null,
  } as unknown as Workshop;
}

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let current: Workshop;
/** The next record save is refused as stale, as lib/http/to-error-body.ts answers it. */
let refuseAsStale: boolean;

beforeEach(() => {
  calls = [];
  refuseAsStale = false;
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    if (call.method === "PUT" && refuseAsStale) {
      refuseAsStale = false;
      const stale = { error: { code: "stale_write", message: "changed" }, currentVersion: 2 };
      return Response.json(stale, { status: 409 });
    }
    // The helpers' route answers with the real calculation behind it.
    const body =
      call.method === "GET"
        ? current
        : url === "/api/balance/hole"
          ? workOutHole(holeRequestSchema.parse(call.body))
          : { record: { version: 2 } };
    return new Response(JSON.stringify(body), {
      status: 200,
      headers: { "content-type": "application/json" },
    });
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderScreen(initial: Workshop) {
  current = initial;
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  render(
    <QueryClientProvider client={client}>
      <RotatingParts jobId={job.id} initial={initial} canEdit />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

const puts = () => calls.filter((c) => c.method === "PUT");

describe("saving a rotating-part record is never silent", () => {
  it("names a correction row without grams beside the row and says it was not saved", async () => {
    const user = renderScreen(workshopWith([]));
    await user.click(screen.getByRole("button", { name: "Add a correction" }));
    await user.click(screen.getByRole("button", { name: "Save record" }));
    expect((await screen.findByTestId("correction-0-error")).textContent).toContain(
      "Correction 1: Enter the grams of this correction",
    );
    expect(screen.getByTestId("rotating-save-status").textContent).toContain(
      "Not saved: one box needs attention",
    );
    expect(puts()).toHaveLength(0);
  });

  it("refuses an angle of 400° with a message beside the box", async () => {
    const user = renderScreen(workshopWith([]));
    await user.type(screen.getByLabelText("before plane A grams"), "3.1");
    await user.type(screen.getByLabelText("before plane A angle"), "400");
    await user.click(screen.getByRole("button", { name: "Save record" }));
    expect(await screen.findByText("An angle from 0 to 360°.")).toBeTruthy();
    expect(screen.getByTestId("rotating-save-status").textContent).toContain("Not saved");
    expect(puts()).toHaveLength(0);
  });

  it("says Saved. once the server took it", async () => {
    const user = renderScreen(workshopWith([]));
    await user.type(screen.getByLabelText("Mass (kg)"), "20");
    // The refetch after the save brings the record at its new version, which remounts the form.
    current = workshopWith([{ part: "crankshaft", data: { massKg: "20" } }]);
    await user.click(screen.getByRole("button", { name: "Save record" }));
    await waitFor(() =>
      expect(screen.getByTestId("rotating-save-status").textContent).toContain("Saved."),
    );
    expect(puts()).toHaveLength(1);
    await waitFor(() => expect(calls.some((c) => c.method === "GET")).toBe(true));
    expect(screen.getByTestId("rotating-save-status").textContent).toContain("Saved.");
  });
});

describe("a record saved on another screen meanwhile", () => {
  it("says so and loads the record as saved now into the form", async () => {
    const user = renderScreen(workshopWith([]));
    await user.type(screen.getByLabelText("Mass (kg)"), "20");
    refuseAsStale = true;
    current = workshopWith([{ part: "crankshaft", data: { massKg: "21.5" } }]);
    await user.click(screen.getByRole("button", { name: "Save record" }));
    const notice = await screen.findByTestId("changed-elsewhere");
    expect(notice.textContent).toContain(
      "someone else changed this crankshaft record since this page loaded",
    );
    await user.click(within(notice).getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(screen.getByLabelText("Mass (kg)")).toHaveProperty("value", "21.5"));
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
    expect(puts()).toHaveLength(1);
  });
});

describe("a flexplate read in one plane", () => {
  // Invented: 10 kg, 3000 rpm, G 6.3, read at 100 mm. ISO 21940-11: e_per = 6.3 / (2π·3000/60)
  // × 1000 = 20.05 g·mm/kg; U_per = 200.5 g·mm (shown to whole g·mm: 201), all in the one
  // plane = 2.0 g at 100 mm.
  const flexplate: RotatingRecordInput = {
    massKg: "10",
    rpm: 3000,
    grade: "6.3",
    radiusMm: "100",
    before: { A: { mass: "12" } },
    after: { A: { mass: "1.9" } },
  };

  it("leads the verdict with grams at the balancer radius, then g·mm", async () => {
    const user = renderScreen(workshopWith([{ part: "flywheel", data: flexplate }]));
    await user.click(screen.getByRole("tab", { name: /Flywheel/ }));
    const verdict = screen.getByTestId("rotating-verdict");
    expect(verdict.textContent).toContain("After: within the grade");
    expect(verdict.textContent).toContain("Residual 1.9 g at 100 mm — allowed 2.0 g: pass");
    expect(verdict.textContent).toContain("190 of 201 g·mm");
    expect(verdict.textContent).toContain("Before: over the grade");
    expect(within(verdict).getByText(/e_per 20 g·mm\/kg/)).toBeTruthy();
    expect((screen.getByRole("radio", { name: /One plane/ }) as HTMLInputElement).checked).toBe(
      true,
    );
  });
});

describe("choosing one plane or two", () => {
  it("drops plane B from a crank record switched to one plane, and saves it as one", async () => {
    const user = renderScreen(workshopWith([]));
    expect(screen.getByLabelText("before plane B grams")).toBeTruthy();
    await user.click(screen.getByRole("radio", { name: /One plane/ }));
    expect(screen.queryByLabelText("before plane B grams")).toBeNull();
    await user.type(screen.getByLabelText("after single plane grams"), "0.3");
    await user.click(screen.getByRole("button", { name: "Save record" }));
    await waitFor(() => expect(puts()).toHaveLength(1));
    expect(puts()[0]!.body).toMatchObject({
      data: { planes: "one", after: { A: { mass: "0.3" }, B: null } },
    });
  });
});

describe("the correction helpers", () => {
  it("sizes a hole for a 3/8 in drill and shows the depth in inches first", async () => {
    const user = renderScreen(workshopWith([]));
    const drill = within(screen.getByTestId("helper-drill"));
    await user.type(drill.getByLabelText("Mass to take out (g)"), "5");
    await user.type(drill.getByLabelText("Drill size"), "3/8");
    await user.type(drill.getByLabelText("Metal there is (mm, optional)"), "9");
    await user.click(drill.getByRole("button", { name: "Work it out" }));
    // Hand check (geometry): r = 4.7625 mm, V = 5 / 7.85 × 1000 = 636.94 mm³,
    // T = 636.94 / 71.256 + 2 × 2.8616 / 3 = 10.847 mm = 0.427 in.
    await waitFor(() =>
      expect(screen.getByTestId("helper-drill").textContent).toContain(
        'Drill 3/8" (9.53 mm) to 0.427 in (10.8 mm) at the tip to take out 5 g.',
      ),
    );
    expect(screen.getByTestId("helper-drill").textContent).toContain("Deeper than the 0.354 in");
    expect(calls.find((c) => c.url === "/api/balance/hole")!.body).toMatchObject({
      kind: "drill",
      diameter: "3/8",
      density: "7.85",
    });
  });

  it("refuses a drill size it cannot read beside the box, without asking the server", async () => {
    const user = renderScreen(workshopWith([]));
    const drill = within(screen.getByTestId("helper-drill"));
    await user.type(drill.getByLabelText("Mass to take out (g)"), "5");
    await user.type(drill.getByLabelText("Drill size"), "3/8x");
    await user.click(drill.getByRole("button", { name: "Work it out" }));
    expect((await drill.findByText(/is not a size we read/)).textContent).toContain("3/8x");
    expect(calls.filter((c) => c.url === "/api/balance/hole")).toHaveLength(0);
  });

  it("counts the point's empty cone under a ½ in heavy-metal plug", async () => {
    const user = renderScreen(workshopWith([]));
    const plug = within(screen.getByTestId("helper-plug"));
    await user.type(plug.getByLabelText("Plug size"), '1/2"');
    await user.type(plug.getByLabelText("Plug length (mm)"), "25");
    await user.click(plug.getByRole("button", { name: "Work it out" }));
    // Worked by hand (geometry): (18.0 − 7.85) × 3.16692 cm³ = 32.144 g, less the 118° cone's
    // 161.11 mm³ of steel, 1.265 g: 30.88 g. Computed masses one decimal finer than 0.1 g.
    await waitFor(() =>
      expect(screen.getByTestId("helper-plug").textContent).toContain(
        'A 1/2" plug adds 30.88 g to the part.',
      ),
    );
    expect(screen.getByTestId("helper-plug").textContent).toContain(
      "of which 1.26 g is the 118° point's cone",
    );
  });
});

describe("a job weighed in ounces with lengths in inches", () => {
  const ozJob = {
    ...job,
    spec: { ...job.spec, massUnit: "oz", scaleResolution: "0.01", lengthUnit: "in" },
  } as Job;
  // An invented crank: 50 lb, 6000 rpm, G 6.3, read at 3 in, two planes half each. By hand
  // (ISO 21940-11, NIST SP 811 factors): 50 lb = 22.6796185 kg, e_per = 6.3 / 628.3185 × 1000
  // = 10.0268 g·mm/kg, U_per = 227.40 g·mm = 227.40 / 720.0779 = 0.3158 oz·in; each plane
  // 0.1579 oz·in, at 3 in 0.05263 oz. A reading of 0.05 oz at 3 in is 0.15 oz·in: within.
  const crank: RotatingRecordInput = {
    massUnit: "oz",
    lengthUnit: "in",
    rotorMass: "50",
    rpm: 6000,
    grade: "6.3",
    radius: "3",
    planes: "two",
    after: { A: { mass: "0.05" }, B: { mass: "0.02" } },
    corrections: [{ plane: "A", method: "drilled", where: "front", mass: "0.45", angle: "90" }],
  };

  it("asks for ounces, pounds and inches and sends the figures as typed with their units", async () => {
    const user = renderScreen(workshopWith([], ozJob));
    expect(screen.getByTestId("rotating-units").textContent).toContain(
      "Balancer readings and corrections in ounces, the rotor in lb, radii in inches.",
    );
    await user.type(screen.getByLabelText("Mass (lb)"), "50");
    await user.type(screen.getByLabelText("Balancer reading radius (in)"), "3.000");
    await user.type(screen.getByLabelText("after plane A ounces"), "0.05");
    await user.type(screen.getByLabelText("after plane B ounces"), "0.015");
    await user.click(screen.getByRole("button", { name: "Save record" }));
    await waitFor(() => expect(puts()).toHaveLength(1));
    expect(puts()[0]!.body).toMatchObject({
      data: {
        massUnit: "oz",
        lengthUnit: "in",
        rotorMass: "50",
        radius: "3.000",
        after: { A: { mass: "0.05" }, B: { mass: "0.015" } },
      },
    });
  });

  it("names ounces when a correction has none", async () => {
    const user = renderScreen(workshopWith([], ozJob));
    await user.click(screen.getByRole("button", { name: "Add a correction" }));
    await user.click(screen.getByRole("button", { name: "Save record" }));
    expect((await screen.findByTestId("correction-0-error")).textContent).toContain(
      "Correction 1: Enter the ounces of this correction",
    );
  });

  it("shows the verdict in ounces at the radius and oz·in, the figures as typed", async () => {
    renderScreen(workshopWith([{ part: "crankshaft", data: crank }], ozJob));
    const verdict = screen.getByTestId("rotating-verdict");
    expect(verdict.textContent).toContain(
      "Plane A: Residual 0.05 oz at 3 in — allowed 0.053 oz: pass",
    );
    expect(verdict.textContent).toContain("0.15 of 0.16 oz·in");
    expect(verdict.textContent).toContain("U_per 0.32 oz·in for the whole part");
    expect(verdict.textContent).not.toMatch(/g·mm| g /);
    expect((screen.getByLabelText("Mass (lb)") as HTMLInputElement).value).toBe("50");
    expect((screen.getByLabelText("Correction 1 ounces") as HTMLInputElement).value).toBe("0.45");
  });

  it("keeps a record typed in grams and mm as typed, and says so", async () => {
    const legacy: RotatingRecordInput = {
      massKg: "10",
      rpm: 3000,
      grade: "6.3",
      radiusMm: "100",
      after: { A: { mass: "1.9" } },
    };
    const user = renderScreen(workshopWith([{ part: "flywheel", data: legacy }], ozJob));
    await user.click(screen.getByRole("tab", { name: /Flywheel/ }));
    expect(screen.getByTestId("rotating-units").textContent).toContain(
      "saved in these units and is shown as typed (the job is now in ounces and inches)",
    );
    expect((screen.getByLabelText("Mass (kg)") as HTMLInputElement).value).toBe("10");
    expect(screen.getByTestId("rotating-verdict").textContent).toContain(
      "Residual 1.9 g at 100 mm — allowed 2.0 g: pass",
    );
  });

  it("moves 1 oz at 3 in to 2 in: 1.500 oz, in the job's units", async () => {
    const user = renderScreen(workshopWith([], ozJob));
    const move = within(screen.getByTestId("helper-move"));
    await user.type(move.getByLabelText("Mass (oz)"), "1");
    await user.type(move.getByLabelText("At radius (in)"), "3");
    await user.type(move.getByLabelText("Wanted radius (in)"), "2");
    await user.click(move.getByRole("button", { name: "Work it out" }));
    // By hand: 1 oz × 3 in / 2 in = 1.5 oz (a computed mass: one decimal finer than 0.01 oz);
    // 1 oz × 3 in = 3 oz·in.
    await waitFor(() =>
      expect(screen.getByTestId("helper-move").textContent).toContain(
        "1.500 oz at 2 in does the same as 1 oz at 3 in (3.0 oz·in).",
      ),
    );
    expect(calls.find((c) => c.url === "/api/balance/hole")!.body).toMatchObject({
      kind: "move",
      massUnit: "oz",
      lengthUnit: "in",
      mass: "1",
    });
  });
});
