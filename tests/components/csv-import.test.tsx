// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen, waitFor, within } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { CsvImport } from "@/components/workshop/csv-import";
import type { CsvPreview } from "@/lib/workshop/csv";

type Call = { method: string; url: string; body: { confirm?: boolean } | null };
let calls: Call[];
/** What is saved for cylinder 1's piston: changed on another screen during the test. */
let savedNow: { readings: string[]; version: number };

const previewOf = (): CsvPreview => ({
  format: "one row per reading",
  unit: "g",
  changes: [
    {
      cylinder: 1,
      kind: "piston",
      phase: "initial",
      current: savedNow.readings,
      next: ["400.0"],
      version: savedNow.version,
    } as CsvPreview["changes"][number],
  ],
  unchanged: 0,
  errors: [],
});

// jsdom's Blob has no text() (browsers do): read it with its FileReader instead.
if (!("text" in Blob.prototype))
  Object.defineProperty(Blob.prototype, "text", {
    configurable: true,
    value(this: Blob) {
      return new Promise<string>((resolve) => {
        const reader = new FileReader();
        reader.onload = () => resolve(String(reader.result));
        reader.readAsText(this);
      });
    },
  });

beforeEach(() => {
  calls = [];
  savedNow = { readings: [], version: 0 };
  vi.stubGlobal("fetch", async (url: string, init: RequestInit = {}) => {
    const call: Call = {
      method: init.method ?? "GET",
      url,
      body: init.body ? JSON.parse(String(init.body)) : null,
    };
    calls.push(call);
    if (call.method === "GET") return Response.json({ job: {}, weights: [], plan: {} });
    if (!call.body?.confirm) return Response.json({ confirmed: false, preview: previewOf() });
    // Someone weighed the piston on the bench since the preview: lib/http/to-error-body.ts's 409.
    savedNow = { readings: ["399.0"], version: 1 };
    return Response.json(
      { error: { code: "stale_write", message: "weight was changed" }, currentVersion: 1 },
      { status: 409 },
    );
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe("a CSV import refused because a weight changed since the preview", () => {
  it("says so and, on Load the latest, shows what the file would change now, saving nothing", async () => {
    const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <CsvImport jobId={7} unit="g" />
      </QueryClientProvider>,
    );
    const user = userEvent.setup();
    const file = new File(["cylinder,part,weight\n1,piston,400.0\n"], "weights.csv", {
      type: "text/csv",
    });
    await user.upload(screen.getByLabelText("File"), file);
    await waitFor(() =>
      expect(screen.getByRole("button", { name: "Show what would change" })).toHaveProperty(
        "disabled",
        false,
      ),
    );
    await user.click(screen.getByRole("button", { name: "Show what would change" }));
    await user.click(await screen.findByRole("button", { name: "Import 1 weight" }));
    const notice = await screen.findByTestId("changed-elsewhere");
    expect(notice.textContent).toContain("someone else changed some of these weights");

    await user.click(within(notice).getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(screen.getByTestId("csv-preview").textContent).toContain("399.0"));
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
    // The bench record was fetched again, then a new preview asked; only one import was tried.
    const posts = calls.filter((c) => c.method === "POST");
    expect(posts.map((c) => Boolean(c.body?.confirm))).toEqual([false, true, false]);
    expect(calls.some((c) => c.method === "GET" && c.url === "/api/jobs/7/workshop")).toBe(true);
  });
});
