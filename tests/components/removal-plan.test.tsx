// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { RemovalPlan } from "@/components/workshop/removal-plan";
import { DEFAULT_SPEC, type Job } from "@/db/jobs";
import type { PartKind } from "@/db/schema";
import type { PartWeight } from "@/db/weights";
import type { Workshop } from "@/lib/workshop/load";
import { buildWorkshopPlan } from "@/lib/workshop/plan";

// The chart draws with ResizeObserver, which jsdom lacks; its figures are not under test here.
vi.mock("@/components/workshop/part-chart", () => ({ PartChart: () => null }));

// The in-line four of tests/lib/workshop/plan.test.ts (grams), where the figures are worked by hand.
const FOUR: Partial<Record<PartKind, string[]>> = {
  piston: ["400.0", "401.2", "400.3", "400.9"],
  wristPin: ["100.0", "100.1", "100.0", "100.2"],
  smallEnd: ["150.0", "150.4", "151.0", "150.2"],
  bigEnd: ["400.0", "400.2", "401.5", "400.1"],
};

function workshopFor(spec: Partial<Job["spec"]>, reweighed: [number, PartKind, string][] = []) {
  const job: Job = {
    id: 3,
    number: "2026-0003",
    customerId: 1,
    customerName: "Test customer",
    engine: "test four",
    status: "machining",
    notes: null,
    version: 1,
    createdAt: "2026-12-01T00:00:00Z",
    updatedAt: "2026-12-01T00:00:00Z",
    spec: { ...DEFAULT_SPEC, layout: "inline-4", cylinders: 4, ...spec },
  };
  const row = (cylinder: number, kind: PartKind, phase: "initial" | "final", v: string) =>
    ({ cylinder, kind, phase, readings: [v], version: 1, updatedAt: "x" }) as PartWeight;
  const weights = [
    ...Object.entries(FOUR).flatMap(([kind, values]) =>
      values!.map((v, i) => row(i + 1, kind as PartKind, "initial", v)),
    ),
    ...reweighed.map(([c, k, v]) => row(c, k, "final", v)),
  ];
  return {
    job,
    weights,
    targets: [],
    rotating: [],
    plan: buildWorkshopPlan(job, weights, []),
    lastPairing: null,
    outlierPercent: "20",
  } as unknown as Workshop;
}

type Call = { method: string; url: string; body: Record<string, unknown> | null };
let calls: Call[];
let answer: (call: Call) => unknown;

beforeEach(() => {
  calls = [];
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    const body = answer(call);
    // An answer in the shape { status, error } stands for a refusal with that status.
    const status =
      body && typeof body === "object" && "status" in body && "error" in body
        ? (body as { status: number }).status
        : 200;
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

function show(workshop: Workshop) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  render(
    <QueryClientProvider client={client}>
      <RemovalPlan jobId={workshop.job.id} initial={workshop} canEdit />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

describe("the removal plan screen", () => {
  it("says where metal comes off and offers no drill depth", () => {
    show(workshopFor({ drillDiameterMm: "8" }));
    expect(
      screen.getByText(/mill the pin bosses or under the crown \(common practice\)/),
    ).toBeTruthy();
    expect(screen.getByText(/grind the big-end cap pad/)).toBeTruthy();
    expect(document.body.textContent).not.toMatch(/drill/i);
    // Matched part by part, a pairing changes nothing: no saving is claimed.
    expect(screen.getByTestId("pairing").textContent).toContain("changes nothing taken off");
  });

  it("shows the target at one decimal past the scale resolution, read-only or as the box's hint", () => {
    // Display rule (lib/balance/display.ts): a target is a worked-out figure, one decimal past the
    // 0.1 g scale. The lightest piston of the four weighs 400.0 g, so the target reads 400.00,
    // never a bare "400". Worked by hand: min(400.0, 401.2, 400.3, 400.9) = 400.0 → "400.00".
    show(workshopFor({}));
    const box = document.getElementById("target-piston") as HTMLInputElement;
    expect(box.placeholder).toBe("400.00");
    cleanup();
    const client = new QueryClient();
    render(
      <QueryClientProvider client={client}>
        <RemovalPlan jobId={3} initial={workshopFor({})} canEdit={false} />
      </QueryClientProvider>,
    );
    expect(document.body.textContent).toContain("Target 400.00 g");
  });

  it("shows an over-machined part in a banner with replace, add weight or re-target and its cost", () => {
    // Piston 2 re-weighed at 399.6, 0.4 under the 400.0 target; re-targeting the pistons to
    // 399.6 takes 0.7 off piston 3 (400.3), worked in tests/lib/workshop/plan.test.ts.
    show(workshopFor({}, [[2, "piston", "399.6"]]));
    const banner = screen.getByTestId("over-machined");
    expect(banner.textContent).toContain("Cylinder 2 piston is 0.40 g light");
    expect(banner.textContent).toContain("replace the part with a heavier one, add weight");
    expect(banner.textContent).toContain(
      "re-targeting the pistons to 399.60 g means taking 0.70 g",
    );
    expect(screen.getByText("Over-machined, 0.40 light")).toBeTruthy();
  });

  it("asks before applying a pairing, names the moves, and offers the undo after", async () => {
    const workshop = workshopFor({ matching: "by-cylinder" });
    const user = show(workshop);
    const pairing = screen.getByTestId("pairing");
    // 5.5 g as numbered, 2.3 g re-paired (hand-worked in tests/lib/workshop/plan.test.ts).
    expect(pairing.textContent).toContain("takes off 2.30 g instead of 5.50 g: 3.20 g less metal");
    await user.click(screen.getByRole("button", { name: "Apply this pairing…" }));
    const dialog = screen.getByRole("alertdialog", { name: "Move these piston assemblies?" });
    expect(dialog.textContent).toContain("the piston of cylinder 4 → cylinder 1");
    await user.click(screen.getByRole("button", { name: "Cancel" }));
    expect(screen.queryByRole("alertdialog")).toBeNull();
    expect(calls.filter((c) => c.method === "POST")).toHaveLength(0);

    answer = () => ({
      ...workshop,
      lastPairing: {
        id: 41,
        action: "pair",
        moves: [{ rodCylinder: 1, pistonFromCylinder: 4 }],
        at: "2026-12-02T09:30:00Z",
      },
    });
    await user.click(screen.getByRole("button", { name: "Apply this pairing…" }));
    await user.click(screen.getByRole("button", { name: "Move them" }));
    await waitFor(() => expect(screen.getByTestId("pairing-undo")).toBeTruthy());
    expect(calls[0]).toMatchObject({
      method: "POST",
      url: "/api/jobs/3/pairing",
      body: { lastPairingId: 0 },
    });
    expect((calls[0]!.body!.assignment as unknown[]).length).toBe(4);

    await user.click(screen.getByRole("button", { name: "Undo this pairing" }));
    await waitFor(() => expect(calls).toHaveLength(2));
    expect(calls[1]).toMatchObject({ url: "/api/jobs/3/pairing/undo", body: { pairingId: 41 } });
  });

  it("says when the target was set on another screen meanwhile, and loads the one saved now", async () => {
    const workshop = workshopFor({});
    const theirs = {
      ...workshop,
      targets: [{ kind: "piston", target: "400.5", version: 2 }],
    } as unknown as Workshop;
    // The 409 lib/http/to-error-body.ts answers for a StaleWriteError; then the latest record.
    answer = (call) =>
      call.method === "PUT"
        ? {
            status: 409,
            error: { code: "stale_write", message: "target was changed" },
            currentVersion: 2,
          }
        : theirs;
    const user = show(workshop);
    const box = document.getElementById("target-piston") as HTMLInputElement;
    await user.type(box, "400.2");
    await user.click(screen.getAllByRole("button", { name: "Set target" })[0]!);
    const notice = await screen.findByTestId("changed-elsewhere");
    expect(notice.textContent).toContain("someone else changed the piston target");
    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(box.value).toBe("400.5"));
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
    // The next save is based on the version loaded.
    answer = () => ({ plan: theirs.plan, target: { kind: "piston", target: "400.5", version: 3 } });
    await user.click(screen.getAllByRole("button", { name: "Set target" })[0]!);
    await waitFor(() => expect(calls.filter((c) => c.method === "PUT")).toHaveLength(2));
    expect(calls.filter((c) => c.method === "PUT")[1]!.body).toMatchObject({ version: 2 });
  });
});
