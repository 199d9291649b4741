// @vitest-environment jsdom
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { BuildRecordScreen } from "@/components/build/build-record-screen";
import { evaluateBuildRecord } from "@/lib/build-record/evaluate";
import type { BuildRecordView } from "@/lib/build-record/record";
import {
  BUILD_SECTIONS,
  type BuildRecordData,
  type BuildSection,
  emptySection,
} from "@/lib/build-record/schemas";
import { EMPTY_BUILD_SETTINGS } from "@/lib/build-record/settings-schema";
import { stubApi } from "./support/stub-api";

// The build record screen typed by keyboard: Enter moves on at once, leaving a box saves its
// section with the version it was based on, figures are worked out as typed.

type Save = { version: number; data: unknown };
let api: ReturnType<typeof stubApi<Save>>;

function viewOf(data: BuildRecordData, version = 0): BuildRecordView {
  const versions = Object.fromEntries(
    BUILD_SECTIONS.map((s) => [s, { version, updatedBy: null, updatedAt: null }]),
  ) as BuildRecordView["versions"];
  return {
    jobId: 7,
    data,
    versions,
    settings: EMPTY_BUILD_SETTINGS,
    results: evaluateBuildRecord(data, EMPTY_BUILD_SETTINGS),
  };
}

const emptyRecord = (): BuildRecordData =>
  Object.fromEntries(
    BUILD_SECTIONS.map((s) => [s, emptySection(s, "in")]),
  ) as unknown as BuildRecordData;

/** The server's answer to a save: the record with that section one version on. */
function saved(section: BuildSection, data: unknown): { status: number; body: unknown } {
  const record = viewOf({ ...emptyRecord(), [section]: data } as BuildRecordData);
  record.versions[section] = { version: 1, updatedBy: "Machinist", updatedAt: "now" };
  return { status: 200, body: { record } };
}

beforeEach(() => {
  api = stubApi<Save>((call) => saved(call.url.split("/").at(-1) as BuildSection, call.body?.data));
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

type JobFigure = { value: string; unit: "in" | "mm" } | null;

function renderScreen(
  data = emptyRecord(),
  readOnly = false,
  job: { bore?: JobFigure; stroke?: JobFigure } = {},
) {
  render(
    <BuildRecordScreen
      initial={viewOf(data)}
      cylinders={4}
      readOnly={readOnly}
      jobBore={job.bore ?? null}
      jobStroke={job.stroke ?? null}
    />,
  );
  return userEvent.setup();
}

describe("the build record screen", () => {
  it("shows every section, each with its figures, for a four-cylinder engine", () => {
    renderScreen();
    expect(screen.getAllByRole("heading", { level: 2 }).map((h) => h.textContent)).toEqual([
      "The engine's own figures",
      "Ring gaps",
      "True TDC (piston stop)",
      "Cam checks (intake centreline, equal lift)",
      "Valve springs",
      "Bearing clearances",
      "Deck clearance and compression ratio",
    ]);
    const cells = (section: BuildSection) =>
      document.querySelectorAll(`[data-section="${section}"] input[data-cell]`).length;
    // Specs: bore, stroke, 3 ring factors, 5 cam card angles, 6 spring figures, 4 clearance
    // limits, 4 compression figures = 24. Rings: 4 cylinders × 3 rings. TDC: 2 stops. Cam: the
    // lift (no checks yet). Springs: 4 × 2 valves × 3. Clearances: (5 mains + 4 rods) × 8
    // readings. Deck: 4 × 2.
    expect(BUILD_SECTIONS.map(cells)).toEqual([24, 12, 2, 1, 24, 72, 8]);
  });

  it("moves on with Enter at once and saves the section on leaving it, with its version", async () => {
    const user = renderScreen();
    await user.click(screen.getByLabelText("Finished bore", { exact: true }));
    await user.keyboard("4.030{Enter}");
    expect(document.activeElement).toBe(screen.getByLabelText("Stroke", { exact: true }));
    await user.keyboard("3.480{Enter}");
    await waitFor(() => expect(api.calls.length).toBeGreaterThanOrEqual(1));
    expect(api.calls[0]).toMatchObject({
      method: "PUT",
      url: "/api/jobs/7/build/specs",
      body: { version: 0, data: { bore: "4.030", lengthUnit: "in" } },
    });
    await waitFor(() => expect(screen.getByTestId("save-specs").textContent).toContain("Saved"));
    // Shift+Enter goes back.
    await user.keyboard("{Shift>}{Enter}{/Shift}");
    expect(document.activeElement).toBe(screen.getByLabelText("Stroke", { exact: true }));
  });

  it("works out what is left to file on a ring as typed (factor × bore, common practice)", async () => {
    const data = emptyRecord();
    data.specs = {
      ...data.specs,
      bore: "4.030",
      ringFactors: { top: "0.0045", second: null, oil: null },
    };
    const user = renderScreen(data);
    // 0.0045 × 4.030 = 0.018135 in to file to; 0.018135 − 0.015 = 0.003135, shown to 0.0001 in.
    const row = screen.getByTestId("ring-1-top");
    expect(within(row).getByText("0.0181")).toBeTruthy();
    await user.click(screen.getByLabelText("Cylinder 1 Top ring gap"));
    await user.keyboard("0.015{Enter}");
    expect(document.activeElement).toBe(screen.getByLabelText("Cylinder 1 Second ring gap"));
    expect(screen.getByTestId("ring-status-1-top").textContent).toContain("File 0.0031");
    expect(
      (screen.getByRole("checkbox", { name: "Cylinder 1 Top ring done" }) as HTMLInputElement)
        .disabled,
    ).toBe(true);
    await waitFor(() => expect(api.calls.some((c) => c.url.endsWith("/rings"))).toBe(true));
    expect(api.calls.find((c) => c.url.endsWith("/rings"))!.body).toEqual({
      version: 0,
      data: { rows: [{ cylinder: 1, ring: "top", readings: ["0.015"], done: false }] },
    });
  });

  it("works out true TDC from the two stops: (−18 + 22) / 2 = 2° ATDC, each stop 20°", async () => {
    const user = renderScreen();
    await user.click(screen.getByLabelText("First stop reading", { exact: true }));
    await user.keyboard("-18{Enter}22{Enter}");
    expect(screen.getByTestId("tdc-result").textContent).toContain(
      "At true TDC the wheel reads 2° ATDC: move the pointer so it reads 0 there; each stop then reads 20°.",
    );
  });

  it("keeps a new spring row only while a figure is in it, and adds a cam check row", async () => {
    const user = renderScreen();
    await user.click(screen.getByLabelText("Cylinder 2 exhaust shim"));
    await user.keyboard("0.030{Enter}");
    await waitFor(() => expect(api.calls.some((c) => c.url.endsWith("/springs"))).toBe(true));
    expect(api.calls.find((c) => c.url.endsWith("/springs"))!.body!.data).toEqual({
      rows: [
        { cylinder: 2, valve: "exhaust", installedHeight: null, shim: "0.030", seatLoad: null },
      ],
    });
    await user.click(screen.getByRole("button", { name: "Add a check" }));
    expect(screen.getByTestId("cam-check-1")).toBeTruthy();
  });

  it("a save someone else got in before: says so, loads the latest, or saves mine over it", async () => {
    // What the server answers for a StaleWriteError (lib/http): 409, code stale_write.
    const theirs = { firstStop: "-20", secondStop: "20" };
    let firstSave = true;
    api.answer = (call) => {
      if (call.method === "GET") {
        const record = viewOf({ ...emptyRecord(), tdc: theirs });
        record.versions.tdc = { version: 3, updatedBy: "Owner", updatedAt: "now" };
        return { status: 200, body: { record } };
      }
      if (firstSave) {
        firstSave = false;
        const message = "build record section was changed by someone else (now at version 3)";
        return {
          status: 409,
          body: { error: { code: "stale_write", message }, currentVersion: 3 },
        };
      }
      return saved("tdc", call.body?.data);
    };
    const user = renderScreen();
    await user.click(screen.getByLabelText("First stop reading", { exact: true }));
    await user.keyboard("-18{Enter}");
    const line = await screen.findByTestId("changed-elsewhere");
    expect(line.textContent).toContain(
      "Not saved: someone else changed the TDC readings since this page loaded.",
    );
    // Mine: saved again over theirs, on the version now stored.
    await user.click(within(line).getByRole("button", { name: "Save mine over it" }));
    await waitFor(() => expect(screen.getByTestId("save-tdc").textContent).toBe("Saved"));
    const puts = api.calls.filter((c) => c.method === "PUT");
    expect(puts.at(-1)!.body).toEqual({
      version: 3,
      data: { firstStop: "-18", secondStop: null },
    });
  });

  it("the latest loaded after a stale save replaces what was typed in that section", async () => {
    const theirs = { firstStop: "-20", secondStop: "20" };
    api.answer = (call) => {
      if (call.method === "GET") {
        const record = viewOf({ ...emptyRecord(), tdc: theirs });
        record.versions.tdc = { version: 3, updatedBy: "Owner", updatedAt: "now" };
        return { status: 200, body: { record } };
      }
      return { status: 409, body: { error: { code: "stale_write", message: "changed" } } };
    };
    const user = renderScreen();
    await user.click(screen.getByLabelText("First stop reading", { exact: true }));
    await user.keyboard("-18{Enter}");
    await user.click(await screen.findByRole("button", { name: "Load the latest" }));
    await waitFor(() =>
      expect(
        (screen.getByLabelText("First stop reading", { exact: true }) as HTMLInputElement).value,
      ).toBe("-20"),
    );
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
  });

  it("read only: nothing can be typed and nothing is saved", async () => {
    const user = renderScreen(emptyRecord(), true);
    expect(
      screen.getByText(/Read only: the machinist and the owner keep this record/),
    ).toBeTruthy();
    const cells = document.querySelectorAll<HTMLInputElement>("input[data-cell]");
    expect([...cells].every((c) => c.readOnly)).toBe(true);
    expect(screen.queryByRole("button", { name: "Add a check" })).toBeNull();
    await user.click(screen.getByLabelText("Finished bore", { exact: true }));
    await user.keyboard("4{Tab}");
    expect(api.calls).toEqual([]);
  });

  it("offers the job's bore and stroke in words beside the blank boxes, and Enter takes them", async () => {
    const user = renderScreen(emptyRecord(), false, {
      bore: { value: "4.030", unit: "in" },
      stroke: { value: "3.480", unit: "in" },
    });
    const bore = screen.getByLabelText("Finished bore", { exact: true }) as HTMLInputElement;
    const stroke = screen.getByLabelText("Stroke", { exact: true }) as HTMLInputElement;
    // Said as the job's, never as grey text in the box that looks typed.
    expect(bore.placeholder).toBe("");
    expect(screen.getByText("Job: 4.030 in — Enter takes it")).toBeTruthy();
    expect(screen.getByText("Job: 3.480 in — Enter takes it")).toBeTruthy();
    expect(bore.getAttribute("aria-describedby")).toBeTruthy();
    await user.click(bore);
    await user.keyboard("{Enter}");
    expect(bore.value).toBe("4.030");
    expect(document.activeElement).toBe(stroke);
    await user.keyboard("{Enter}");
    expect(stroke.value).toBe("3.480");
    expect(screen.queryByText(/Enter takes it/)).toBeNull();
    await waitFor(() => expect(api.calls.length).toBeGreaterThanOrEqual(1));
    expect(api.calls.at(-1)!.body).toMatchObject({
      data: { bore: "4.030", stroke: "3.480", lengthUnit: "in" },
    });
  });

  it("does not offer the job's bore to a record kept in the other unit (4.030 in is not 4.030 mm)", () => {
    const data = emptyRecord();
    data.specs = { ...data.specs, lengthUnit: "mm" };
    renderScreen(data, false, { bore: { value: "4.030", unit: "in" } });
    expect(screen.queryByText(/Enter takes it/)).toBeNull();
  });

  it("ring gaps: a target gap and what is still to file off, or why there is no target yet", () => {
    const data = emptyRecord();
    renderScreen(data);
    const rings = document.querySelector('[data-section="rings"]') as HTMLElement;
    const headings = [...rings.querySelectorAll("thead th")].map((th) => th.textContent);
    expect(headings).toContain("Target gap (in)");
    expect(headings).toContain("Still to file off");
    expect(screen.getByTestId("ring-target-why").textContent).toBe(
      "No target gap yet: enter the finished bore and the gap factors above.",
    );
    // The row's own cell says it too, for a screen reader (the dash alone says nothing).
    expect(screen.getByTestId("ring-target-1-top").textContent).toContain(
      "enter the finished bore and the gap factors above",
    );
  });

  it("ring gaps: with the bore and the top factor, only the rings without a factor are named", () => {
    const data = emptyRecord();
    data.specs = {
      ...data.specs,
      bore: "4.030",
      ringFactors: { top: "0.0045", second: null, oil: null },
    };
    renderScreen(data);
    expect(screen.getByTestId("ring-target-why").textContent).toBe(
      "No target gap for the second ring and oil rails: enter the gap factors above.",
    );
    // 0.0045 × 4.030 = 0.018135 in, shown to the bore's 0.001 plus one: 0.0181.
    expect(screen.getByTestId("ring-target-1-top").textContent).toBe("0.0181");
  });

  it("bearing clearances: each of the eight readings has its own heading, box label and unit", () => {
    renderScreen();
    const section = document.querySelector('[data-section="clearances"]') as HTMLElement;
    const headings = [...section.querySelectorAll("thead th")].map((th) => th.textContent);
    expect(headings).toEqual(
      expect.arrayContaining(["Bearing bore (in)", "Journal (in)", "Clearance (in)"]),
    );
    const places = ["Front vertical", "Front horizontal", "Rear vertical", "Rear horizontal"];
    expect(headings.filter((h) => places.includes(h ?? ""))).toEqual([...places, ...places]);
    const row = screen.getByTestId("clearance-main-1");
    const labels = [...row.querySelectorAll("input[data-cell]")].map((i) =>
      i.getAttribute("aria-label"),
    );
    expect(labels).toEqual([
      "Main 1 bore front vertical (in)",
      "Main 1 bore front horizontal (in)",
      "Main 1 bore rear vertical (in)",
      "Main 1 bore rear horizontal (in)",
      "Main 1 journal front vertical (in)",
      "Main 1 journal front horizontal (in)",
      "Main 1 journal rear vertical (in)",
      "Main 1 journal rear horizontal (in)",
    ]);
  });

  it("every figure of a row carries its column's words for the stacked phone layout", () => {
    renderScreen();
    const spring = screen.getByTestId("spring-1-intake");
    const labelled = [...spring.querySelectorAll("td[data-label]")].map((td) =>
      td.getAttribute("data-label"),
    );
    expect(labelled).toEqual([
      "Installed height",
      "Shim",
      "Load at height",
      "Seat",
      "Open",
      "Coil-bind margin",
    ]);
    // The card's own title says which cylinder and valve (the Cyl column is blank on exhaust rows).
    expect(
      within(screen.getByTestId("spring-1-exhaust")).getByText("Cylinder 1, exhaust"),
    ).toBeTruthy();
  });
});
