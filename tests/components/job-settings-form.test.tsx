// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { JobSettingsForm } from "@/components/jobs/job-settings-form";
import { DEFAULT_SPEC, type Job, type JobSpec } from "@/db/jobs";

vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh: () => undefined }) }));

const jobWith = (spec: Partial<JobSpec>): Job => ({
  id: 9,
  number: "2026-0009",
  customerId: 1,
  customerName: "Wren Talbot",
  engine: "invented engine",
  status: "booked",
  notes: null,
  version: 3,
  createdAt: "2026-12-01T00:00:00Z",
  updatedAt: "2026-12-01T00:00:00Z",
  spec: { ...DEFAULT_SPEC, ...spec },
});

type Call = {
  method: string;
  url: string;
  body: { version: number; spec: Record<string, unknown> } | null;
};
let calls: Call[];
let answer: (call: Call) => { status: number; body: unknown };

beforeEach(() => {
  calls = [];
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call = {
      method: init.method ?? "GET",
      url,
      body: init.body === undefined ? null : JSON.parse(String(init.body)),
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

function renderForm(job: Job, role = "machinist") {
  const client = new QueryClient();
  render(
    <QueryClientProvider client={client}>
      <JobSettingsForm job={job} role={role} />
    </QueryClientProvider>,
  );
  return userEvent.setup();
}

const save = (user: ReturnType<typeof userEvent.setup>) =>
  user.click(screen.getByRole("button", { name: "Save settings" }));

describe("the job settings form", () => {
  it("saves with the boxes blank that say blank is allowed", async () => {
    const job = jobWith({ layout: "v8-cross-plane", cylinders: 8, balanceFactor: "50" });
    answer = () => ({ status: 200, body: { job, notices: [] } });
    const user = renderForm(job);
    await user.clear(screen.getByLabelText(/^Balance factor/));
    await save(user);
    await waitFor(() => expect(calls).toHaveLength(1));
    expect(calls[0]!.body!.spec).toMatchObject({
      balanceFactor: null,
      drillSize: null,
      promisedDate: null,
      maxRpm: null,
      bore: null,
    });
    expect(calls[0]!.body!.version).toBe(3);
    await waitFor(() => expect(screen.getByTestId("settings-message").textContent).toBe("Saved."));
  });

  it("shows what the server converted, and the converted figures in the boxes", async () => {
    const job = jobWith({ layout: "inline-4", cylinders: 4 });
    const converted = jobWith({
      layout: "inline-4",
      cylinders: 4,
      massUnit: "oz",
      scaleResolution: "0.002",
      tolerance: "0.018",
    });
    const notice = "Weights now in ounces: scale resolution 0.1 g is now 0.002 oz.";
    answer = () => ({
      status: 200,
      body: { job: { ...converted, version: 4 }, notices: [notice] },
    });
    const user = renderForm(job);
    await user.selectOptions(screen.getByLabelText("Weights in"), "oz");
    await save(user);
    await waitFor(() =>
      expect(screen.getByTestId("settings-message").textContent).toContain(notice),
    );
    expect(screen.getByLabelText(/^Scale resolution/)).toHaveProperty("value", "0.002");
    expect(screen.getByLabelText(/^Tolerance/)).toHaveProperty("value", "0.018");
    expect(screen.getByLabelText(/^Scale resolution \(oz\)/)).toBeTruthy();
  });

  it("refuses a figure that is not a number beside its box, in the machinist's words, and sends nothing", async () => {
    const user = renderForm(jobWith({ layout: "inline-4", cylinders: 4 }));
    answer = () => ({ status: 500, body: {} });
    await user.clear(screen.getByLabelText(/^Scale resolution/));
    await user.type(screen.getByLabelText(/^Scale resolution/), "0,1");
    await save(user);
    await waitFor(() =>
      expect(screen.getByTestId("error-scaleResolution").textContent).toMatch(
        /^Scale resolution: enter a number like 0\.1/,
      ),
    );
    expect(screen.getByTestId("settings-message").textContent).toContain("Not saved");
    expect(calls).toHaveLength(0);
  });

  it("puts the server's refusal beside the box it names", async () => {
    const user = renderForm(jobWith({ layout: "v8-cross-plane", cylinders: 8 }));
    const refusal = 'Drill size "7/0" is not a size we read.';
    answer = () => ({
      status: 422,
      body: {
        error: { code: "invalid_input", message: refusal, fields: { "spec.drillSize": refusal } },
      },
    });
    await save(user);
    await waitFor(() => expect(screen.getByTestId("error-drillSize").textContent).toBe(refusal));
    expect(screen.getByTestId("settings-message").textContent).toBe(`Not saved: ${refusal}`);
  });

  it("has no balance factor box on a layout balanced without bobweights", () => {
    renderForm(jobWith({ layout: "inline-4", cylinders: 4 }));
    expect(screen.getByTestId("no-bobweight").textContent).toContain("No bobweight needed");
    expect(screen.queryByLabelText(/^Balance factor/)).toBeNull();
  });
});

describe("a job changed on another screen since the page loaded", () => {
  it("says so, loads the latest into the form, and the next save is based on it", async () => {
    const mine = jobWith({ layout: "v8-cross-plane", cylinders: 8, scaleName: "bench scale" });
    const theirs = { ...mine, version: 4, spec: { ...mine.spec, scaleName: "counter scale" } };
    // What lib/http/to-error-body.ts answers for a StaleWriteError.
    answer = (call) =>
      call.method === "GET"
        ? { status: 200, body: { job: theirs } }
        : call.body!.version === 3
          ? {
              status: 409,
              body: {
                error: { code: "stale_write", message: "job was changed by someone else" },
                currentVersion: 4,
              },
            }
          : { status: 200, body: { job: theirs, notices: [] } };
    const user = renderForm(mine);
    await save(user);
    const notice = await screen.findByTestId("changed-elsewhere");
    expect(notice.textContent).toContain(
      "someone else changed this job's settings since this page loaded",
    );
    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    await waitFor(() =>
      expect(screen.getByLabelText("Scale used")).toHaveProperty("value", "counter scale"),
    );
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
    await save(user);
    await waitFor(() => expect(calls.filter((c) => c.method === "PATCH")).toHaveLength(2));
    expect(calls.at(-1)!.body!.version).toBe(4);
  });
});
