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
  localStorage.clear();
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

function renderGrid(start: Workshop = initial, retryBaseMs?: number) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  render(
    <QueryClientProvider client={client}>
      {/* Any link of the app (next/link renders an <a> too); the grid watches clicks on links. */}
      {/* eslint-disable-next-line @next/next/no-html-link-for-pages */}
      <a href="/jobs/7/plan">Metal to remove</a>
      <WeighGrid jobId={job.id} initial={start} canEdit retryBaseMs={retryBaseMs} />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

const cell = (cyl: number, label: string) => screen.getByLabelText(`Cylinder ${cyl} ${label}, g`);
const puts = () => calls.filter((c) => c.method === "PUT").map((c) => c.body);

describe("the weigh-in keyboard flow", () => {
  it("saves a weight on Enter and moves down the column (all pistons first)", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    expect(document.activeElement).toBe(cell(2, "Piston"));
    await user.keyboard("497.9{Enter}");
    // After the last piston, Enter goes to the first wrist pin.
    expect(document.activeElement).toBe(cell(1, "Wrist pin"));
    await waitFor(() => expect(puts()).toHaveLength(2));
    expect(puts()).toEqual([
      { cylinder: 1, kind: "piston", readings: ["498.6"], version: 0, phase: "initial" },
      { cylinder: 2, kind: "piston", readings: ["497.9"], version: 0, phase: "initial" },
    ]);
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("saved"),
    );
  });

  it("goes across the row when the machinist weighs cylinder by cylinder", async () => {
    const user = renderGrid();
    await user.click(screen.getByLabelText(/Enter goes across/));
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}142.3{Enter}");
    expect(document.activeElement).toBe(cell(1, "Pin retainers"));
    await waitFor(() => expect(puts().map((p) => p!.kind)).toEqual(["piston", "wristPin"]));
  });

  it("keeps repeated readings of one part and shows their spread", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6 498.8{Enter}");
    await waitFor(() => expect(puts()[0]).toMatchObject({ readings: ["498.6", "498.8"] }));
    // A difference of readings is worked out: one decimal finer than the 0.1 g scale.
    expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("spread 0.20");
  });

  it("stays on a box that is not a number, says why, and sends nothing", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("49a.6{Enter}");
    expect(document.activeElement).toBe(cell(1, "Piston"));
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("Enter a number"),
    );
    expect(puts()).toHaveLength(0);
  });

  it("shows what changed when someone else saved the part first, and sends nothing twice", async () => {
    answer = (call) =>
      call.method === "PUT"
        ? {
            status: 409,
            body: { error: { code: "stale_write", message: "changed" }, currentVersion: 1 },
          }
        : {
            status: 200,
            body: {
              ...initial,
              weights: [
                {
                  cylinder: 1,
                  kind: "piston",
                  phase: "initial",
                  readings: ["499.0"],
                  version: 1,
                  updatedAt: "now",
                },
              ],
            },
          };
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain(
        "someone else changed cylinder 1 piston since this page loaded. Saved now: 499.0 g.",
      ),
    );
    expect(puts()).toHaveLength(1);
    // Loading the latest puts what is saved now in the box and sends nothing.
    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    expect(cell(1, "Piston")).toHaveProperty("value", "499.0");
    expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("saved");
    expect(puts()).toHaveLength(1);
  });
});

describe("a weight far from the rest of its kind", () => {
  // Cylinder 1's piston is weighed at 498.6 g; "4986" for cylinder 2 is a missed decimal point:
  // 4986 / 498.6 = 10×, far past the 5 % limit (common practice for a matched set).
  const weighed: Workshop = {
    ...initial,
    weights: [
      {
        cylinder: 1,
        kind: "piston",
        phase: "initial",
        readings: ["498.6"],
        confirmedOutlier: false,
        version: 1,
        updatedAt: "now",
      },
    ],
  };
  const HELD_MESSAGE =
    "Cylinder 2 piston: 4986 g is 10× the other piston (498.6 g) — a missed decimal point? " +
    "Confirm it if that is what the scale read, or retype it.";

  beforeEach(() => {
    // The server's rule (tests/api/weights-outlier.test.ts covers it): 4986 is held unless confirmed.
    answer = (call) =>
      call.body?.readings &&
      (call.body.readings as string[])[0] === "4986" &&
      !call.body.confirmOutlier
        ? {
            status: 422,
            body: {
              error: { code: "outlier", message: HELD_MESSAGE, fields: { readings: HELD_MESSAGE } },
            },
          }
        : {
            status: 200,
            body: {
              weight: {
                ...call.body,
                confirmedOutlier: Boolean(call.body?.confirmOutlier),
                version: 1,
                updatedAt: "now",
              },
              plan: emptyPlan,
            },
          };
  });

  it("stays on the part, shows the server's answer and puts Keep under Enter", async () => {
    const user = renderGrid(weighed);
    await user.click(cell(2, "Piston"));
    await user.keyboard("4986{Enter}");
    await waitFor(() =>
      expect(screen.getByTestId("held-c2_piston").textContent).toContain(HELD_MESSAGE),
    );
    expect(puts()).toEqual([
      { cylinder: 2, kind: "piston", readings: ["4986"], version: 0, phase: "initial" },
    ]);
    const keep = screen.getByRole("button", { name: /Keep 4986 g/ });
    await waitFor(() => expect(document.activeElement).toBe(keep));
    expect(screen.getByTestId("cell-note-c2_piston").textContent).toContain("held");

    // Enter keeps it as read: sent again with the confirmation, then on to the next part.
    await user.keyboard("{Enter}");
    await waitFor(() => expect(puts()).toHaveLength(2));
    expect(puts()[1]).toEqual({
      cylinder: 2,
      kind: "piston",
      readings: ["4986"],
      version: 0,
      phase: "initial",
      confirmOutlier: true,
    });
    await waitFor(() => expect(document.activeElement).toBe(cell(1, "Wrist pin")));
    expect(screen.queryByTestId("held-weights")).toBeNull();
  });

  it("goes back to the part on Escape, to retype it", async () => {
    const user = renderGrid(weighed);
    await user.click(cell(2, "Piston"));
    await user.keyboard("4986{Enter}");
    const keep = await screen.findByRole("button", { name: /Keep 4986 g/ });
    await waitFor(() => expect(document.activeElement).toBe(keep));
    await user.keyboard("{Escape}");
    expect(document.activeElement).toBe(cell(2, "Piston"));
    // The text is selected: typing replaces it.
    await user.keyboard("498.6{Enter}");
    expect(document.activeElement).toBe(cell(1, "Wrist pin"));
    await waitFor(() => expect(puts()).toHaveLength(2));
    expect(puts()[1]).toMatchObject({ cylinder: 2, readings: ["498.6"] });
    expect(puts()[1]).not.toHaveProperty("confirmOutlier");
  });

  it("does not send held readings again when the box is left without an answer", async () => {
    const user = renderGrid(weighed);
    await user.click(cell(2, "Piston"));
    await user.keyboard("4986{Enter}");
    await screen.findByRole("button", { name: /Keep 4986 g/ });
    await user.click(cell(1, "Wrist pin"));
    await user.click(cell(2, "Piston"));
    await user.click(cell(1, "Wrist pin"));
    expect(puts()).toHaveLength(1);
  });

  it("shows a hold the server found that the grid did not expect, without taking the focus", async () => {
    // Nothing weighed here yet: the grid cannot tell, so Enter moves on and the blur saves.
    const user = renderGrid();
    await user.click(cell(2, "Piston"));
    await user.keyboard("4986{Enter}");
    expect(document.activeElement).toBe(cell(1, "Wrist pin"));
    await waitFor(() =>
      expect(screen.getByTestId("held-c2_piston").textContent).toContain(HELD_MESSAGE),
    );
    expect(document.activeElement).toBe(cell(1, "Wrist pin"));
  });

  it("refuses zero at the grid, saying why, and sends nothing", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("0{Enter}");
    expect(document.activeElement).toBe(cell(1, "Piston"));
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain(
        "A weight of zero is not a reading",
      ),
    );
    expect(puts()).toHaveLength(0);
  });
});

const weight = (cylinder: number, kind: string, value: string, phase = "initial") => ({
  cylinder,
  kind: kind as Workshop["weights"][number]["kind"],
  phase: phase as "initial" | "final",
  readings: [value],
  confirmedOutlier: false,
  version: 1,
  updatedAt: "now",
});

describe("where the grid starts", () => {
  it("puts the cursor in the first part still to weigh on load, no Tab needed", async () => {
    renderGrid();
    await waitFor(() => expect(document.activeElement).toBe(cell(1, "Piston")));
  });

  it("skips parts already weighed (Enter's order: all pistons first)", async () => {
    renderGrid({ ...initial, weights: [weight(1, "piston", "498.6")] });
    await waitFor(() => expect(document.activeElement).toBe(cell(2, "Piston")));
  });
});

describe("the re-weigh after machining", () => {
  // The plan machined cylinder 1's piston and cylinder 2's big end; the rest was in the band.
  const part = (cylinder: number, kind: string, status: string) => ({
    cylinder,
    kind,
    status,
    measured: "0",
    remove: "0",
    final: "0",
  });
  const machinedPlan = {
    ...emptyPlan,
    complete: true,
    removal: {
      parts: [
        part(1, "piston", "remove"),
        part(2, "piston", "ok"),
        part(1, "wristPin", "ok"),
        part(2, "wristPin", "ok"),
        part(1, "smallEnd", "ok"),
        part(2, "smallEnd", "ok"),
        part(1, "bigEnd", "ok"),
        part(2, "bigEnd", "remove"),
      ],
    },
    progress: {
      "1:piston": { state: "to-do" as const, amount: "0.7" },
      "2:bigEnd": { state: "to-do" as const, amount: "1.4" },
    },
  } as unknown as Workshop["plan"];

  it("starts in the first machined part and Enter walks only the machined parts", async () => {
    answer = (call) => ({
      status: 200,
      body: { weight: { ...call.body, version: 1, updatedAt: "now" }, plan: machinedPlan },
    });
    const user = renderGrid({ ...initial, plan: machinedPlan });
    await user.click(screen.getByLabelText("After machining"));
    await waitFor(() => expect(document.activeElement).toBe(cell(1, "Piston")));
    expect(screen.getByTestId("reweigh-walk").textContent).toContain("2 parts the plan machined");
    await user.keyboard("497.9{Enter}");
    // 14 boxes lie between them in the column order (pins, retainers, rings, small ends, c1's
    // big end): none of them is visited.
    expect(document.activeElement).toBe(cell(2, "Big end"));
    await user.keyboard("451.1{Enter}");
    await waitFor(() => expect(puts()).toHaveLength(2));
    expect(puts()).toEqual([
      { cylinder: 1, kind: "piston", readings: ["497.9"], version: 0, phase: "final" },
      { cylinder: 2, kind: "bigEnd", readings: ["451.1"], version: 0, phase: "final" },
    ]);
  });

  it("lets Enter from a part outside the walk go on to the next machined part", async () => {
    const user = renderGrid({ ...initial, plan: machinedPlan });
    await user.click(screen.getByLabelText("After machining"));
    await user.click(cell(1, "Wrist pin"));
    await user.keyboard("142.2{Enter}");
    expect(document.activeElement).toBe(cell(2, "Big end"));
  });
});

describe("a save the network drops", () => {
  const down = () => {
    throw new TypeError("Failed to fetch");
  };
  const stored = (phase = "initial") =>
    JSON.parse(localStorage.getItem(`counterpoise:weigh-queue:7:${phase}`) ?? "[]");

  it("is kept on this PC with the version it was based on, counted, and sent on Retry", async () => {
    let online = false;
    const up = answer;
    answer = (call) => (call.method === "PUT" && !online ? down() : up(call));
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}497.9{Enter}");
    await waitFor(() =>
      expect(screen.getByTestId("unsaved-weights").textContent).toContain(
        "2 weights not saved yet",
      ),
    );
    expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("not saved yet");
    expect(stored()).toEqual([
      expect.objectContaining({ name: "c1_piston", readings: ["498.6"], version: 0 }),
      expect.objectContaining({ name: "c2_piston", readings: ["497.9"], version: 0 }),
    ]);
    // What was typed stays in the boxes.
    expect(cell(1, "Piston")).toHaveProperty("value", "498.6");

    online = true;
    await user.click(screen.getByRole("button", { name: "Retry now" }));
    await waitFor(() => expect(screen.queryByTestId("unsaved-weights")).toBeNull());
    expect(localStorage.getItem("counterpoise:weigh-queue:7:initial")).toBeNull();
    const sent = puts().slice(-2);
    expect(sent).toEqual([
      { cylinder: 1, kind: "piston", readings: ["498.6"], version: 0, phase: "initial" },
      { cylinder: 2, kind: "piston", readings: ["497.9"], version: 0, phase: "initial" },
    ]);
    expect(screen.getByTestId("cell-note-c2_piston").textContent).toContain("saved");
  });

  it("is tried again on its own, waiting longer each time, until the server answers", async () => {
    let failures = 0;
    const up = answer;
    answer = (call) => {
      if (call.method === "PUT" && failures < 3) {
        failures += 1;
        return down();
      }
      return up(call);
    };
    const user = renderGrid(initial, 20);
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    await waitFor(() => expect(screen.queryByTestId("unsaved-weights")).not.toBeNull());
    // 20, 40 then 80 ms: three failures, then the fourth try is answered.
    await waitFor(() => expect(screen.queryByTestId("unsaved-weights")).toBeNull(), {
      timeout: 2000,
    });
    expect(puts()).toHaveLength(4);
    expect(stored()).toEqual([]);
  });

  it("comes back after a reload and is sent with the version it was based on", async () => {
    localStorage.setItem(
      "counterpoise:weigh-queue:7:initial",
      JSON.stringify([
        {
          name: "c2_piston",
          phase: "initial",
          cylinder: 2,
          kind: "piston",
          readings: ["497.9"],
          version: 1,
        },
      ]),
    );
    renderGrid({ ...initial, weights: [weight(2, "piston", "497.5")] });
    expect(cell(2, "Piston")).toHaveProperty("value", "497.9");
    await waitFor(() => expect(puts()).toHaveLength(1));
    expect(puts()[0]).toEqual({
      cylinder: 2,
      kind: "piston",
      readings: ["497.9"],
      version: 1,
      phase: "initial",
    });
    await waitFor(() => expect(stored()).toEqual([]));
  });

  it("gets the conflict view when the part changed elsewhere since it was typed", async () => {
    localStorage.setItem(
      "counterpoise:weigh-queue:7:initial",
      JSON.stringify([
        {
          name: "c1_piston",
          phase: "initial",
          cylinder: 1,
          kind: "piston",
          readings: ["498.6"],
          version: 0,
        },
      ]),
    );
    answer = (call) =>
      call.method === "PUT"
        ? { status: 409, body: { error: { code: "stale_write", message: "changed" } } }
        : { status: 200, body: { ...initial, weights: [weight(1, "piston", "499.0")] } };
    renderGrid();
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain(
        "Saved now: 499.0 g. Load the latest Yours (498.6) is kept here until you choose.",
      ),
    );
    expect(stored()).toEqual([]);
    expect(screen.queryByTestId("unsaved-weights")).toBeNull();
  });
});

describe("leaving with weights not saved", () => {
  const unload = () => {
    const event = new Event("beforeunload", { cancelable: true });
    window.dispatchEvent(event);
    return event;
  };

  it("lets the page go when everything is saved", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    await waitFor(() => expect(puts()).toHaveLength(1));
    await waitFor(() =>
      expect(screen.getByTestId("cell-note-c1_piston").textContent).toContain("saved"),
    );
    expect(unload().defaultPrevented).toBe(false);
  });

  it("asks before a reload when a typed weight is not saved, and keeps it for after", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6"); // typed, neither Enter nor blur yet
    expect(unload().defaultPrevented).toBe(true);
    expect(JSON.parse(localStorage.getItem("counterpoise:weigh-queue:7:initial") ?? "[]")).toEqual([
      expect.objectContaining({ name: "c1_piston", readings: ["498.6"], version: 0 }),
    ]);
  });

  /** The network drops every save; the machinist answers "stay" (false) to the question. */
  const cutOffAndStay = () => {
    answer = (call) => {
      if (call.method === "PUT") throw new TypeError("Failed to fetch");
      return { status: 200, body: {} };
    };
    const confirm = vi.fn(() => false);
    vi.stubGlobal("confirm", confirm);
    return confirm;
  };

  it("asks before following a link in the app while saves are queued", async () => {
    const confirm = cutOffAndStay();
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    await screen.findByTestId("unsaved-weights");
    const followed = vi.fn((e: MouseEvent) => e.preventDefault());
    const link = screen.getByRole("link", { name: "Metal to remove" });
    link.addEventListener("click", followed);
    await user.click(link);
    expect(confirm).toHaveBeenCalledWith(expect.stringContaining("1 weight is not saved yet"));
    expect(followed).not.toHaveBeenCalled();
    // Said yes: the link is followed (the weight stays queued on this PC).
    confirm.mockReturnValue(true);
    await user.click(link);
    expect(followed).toHaveBeenCalledTimes(1);
  });

  it("asks on the browser's Back while saves are queued, and stays when told to", async () => {
    const confirm = cutOffAndStay();
    // A fresh entry: earlier tests in this window may have left the extra one.
    window.history.pushState(null, "", "/jobs/7/weigh");
    const user = renderGrid();
    const entries = window.history.length;
    await user.click(cell(1, "Piston"));
    await user.keyboard("498.6{Enter}");
    await screen.findByTestId("unsaved-weights");
    // Something unsaved: an extra entry for this same page stands in front of Back.
    await waitFor(() => expect(window.history.length).toBe(entries + 1));
    const address = window.location.href;
    // The router's own listener must not see the Back it asked about.
    const router = vi.fn();
    window.addEventListener("popstate", router);
    window.history.back();
    await waitFor(() =>
      expect(confirm).toHaveBeenCalledWith(expect.stringContaining("1 weight is not saved yet")),
    );
    expect(router).not.toHaveBeenCalled();
    expect(window.location.href).toBe(address);
    // Stayed: the extra entry is back, so the next Back asks again.
    expect(window.history.state).toMatchObject({ counterpoiseWeighBackGuard: true });
    window.removeEventListener("popstate", router);
  });
});

describe("the readings box", () => {
  it("widens to what is typed, so repeated readings are seen whole", async () => {
    const user = renderGrid();
    await user.click(cell(1, "Piston"));
    await user.keyboard("482.6 482.6 482.8");
    // 17 characters in a monospace font: the box is at least 17 ch wide (plus its padding).
    const width = Number(cell(1, "Piston").style.getPropertyValue("--cell-ch"));
    expect(width).toBeGreaterThanOrEqual("482.6 482.6 482.8".length);
  });
});
