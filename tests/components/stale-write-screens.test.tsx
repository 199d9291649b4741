// @vitest-environment jsdom
import { cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { BuildRequest } from "@/db/build-record";
import type { CounterSettings } from "@/db/counter-settings";
import type { PriceItem } from "@/db/prices";
import type { ActionResult } from "@/lib/http/action-result";
import { EMPTY_BUILD_SETTINGS } from "@/lib/build-record/settings-schema";
import { stubApi } from "./support/stub-api";

// Every screen that saves over a version read answers a stale write (409 `stale_write`, the body
// lib/http/to-error-body.ts gives a StaleWriteError) with the one ChangedElsewhere view: what
// changed, no internal version number, one button that loads the latest. Other 409s are rules and
// keep their own words.

const refresh = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ refresh }) }));

const priceUpdate = vi.fn<(form: FormData) => ActionResult<PriceItem>>();
vi.mock("@/app/(shop)/prices/actions", () => ({
  updatePriceAction: async (_prev: unknown, form: FormData) => priceUpdate(form),
  createPriceAction: async () => ({ ok: false, status: 422, message: "unused" }),
}));

const { CounterSettingsForm } = await import("@/components/customer/counter-settings-form");
const { BuildSettingsForm } = await import("@/components/build/build-settings-form");
const { BuildRequests } = await import("@/components/build/build-requests");
const { PriceRow } = await import("@/components/billing/price-forms");

const staleBody = (entity: string, version: number) => ({
  error: {
    code: "stale_write",
    message: `${entity} was changed by someone else (now at version ${version})`,
  },
  currentVersion: version,
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  refresh.mockReset();
  priceUpdate.mockReset();
});

/** The one view is shown, names `what`, and no version number reaches the person. */
function expectChangedElsewhere(what: string) {
  const view = screen.getByTestId("changed-elsewhere");
  expect(view.textContent).toContain(`someone else changed ${what} since this page loaded`);
  expect(view.textContent).not.toMatch(/version|\b7\b/);
  return view;
}

describe("shop e-mail and time zone settings", () => {
  const initial: CounterSettings = {
    senderName: "Front desk",
    replyTo: null,
    signature: null,
    mailOff: [],
    timeZone: "UTC",
    version: 6,
    updatedAt: "2026-12-01T00:00:00Z",
  };

  it("a stale save shows the one view; Load the latest puts the saved settings in the boxes", async () => {
    const saved = { ...initial, senderName: "Counter", version: 7 };
    const api = stubApi((call) =>
      call.method === "PUT"
        ? { status: 409, body: staleBody("settings", 7) }
        : { status: 200, body: { settings: saved } },
    );
    render(<CounterSettingsForm initial={initial} shopName="Invented Shop" shopEmail={null} />);
    const user = userEvent.setup();
    await user.click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() => expectChangedElsewhere("the e-mail and time zone settings"));
    expect(screen.getByTestId("counter-settings-message").textContent).not.toContain("reload");

    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(screen.queryByTestId("changed-elsewhere")).toBeNull());
    expect(screen.getByLabelText("Sender name")).toHaveProperty("value", "Counter");
    // The next save goes over the version just loaded.
    api.answer = () => ({ status: 200, body: { settings: { ...saved, version: 8 } } });
    await user.click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() => expect(api.calls.filter((c) => c.method === "PUT")).toHaveLength(2));
    expect((api.calls.at(-1)!.body as { version: number }).version).toBe(7);
  });
});

describe("build settings", () => {
  it("a stale save shows the one view; Load the latest fills the boxes from the server", async () => {
    stubApi((call) =>
      call.method === "PUT"
        ? { status: 409, body: staleBody("build settings", 7) }
        : {
            status: 200,
            body: { settings: { ...EMPTY_BUILD_SETTINGS, camCheckLift: "0.050" }, version: 7 },
          },
    );
    render(<BuildSettingsForm initial={EMPTY_BUILD_SETTINGS} version={6} />);
    const user = userEvent.setup();
    await user.click(screen.getByRole("button", { name: "Save build settings" }));
    await waitFor(() => expectChangedElsewhere("the build settings"));
    expect(screen.getByTestId("build-settings-message").textContent).toBe("");

    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    await waitFor(() => expect(screen.queryByTestId("changed-elsewhere")).toBeNull());
    expect(screen.getByLabelText(/Lift for cam checks/)).toHaveProperty("value", "0.050");
  });
});

describe("customer's requests for the build", () => {
  const request = (state: BuildRequest["state"], version: number): BuildRequest => ({
    id: 4,
    jobId: 9,
    text: "fit the timing gear they brought",
    state,
    note: null,
    version,
    createdBy: "Counter",
    createdAt: "2026-12-01T00:00:00Z",
    updatedBy: null,
    updatedAt: "2026-12-01T00:00:00Z",
  });

  it("a stale tick says what the request is now and loads the list on request", async () => {
    stubApi((call) =>
      call.method === "PATCH"
        ? { status: 409, body: staleBody("request", 7) }
        : { status: 200, body: { requests: [request("done", 7)] } },
    );
    render(<BuildRequests jobId={9} role="machinist" initial={[request("open", 6)]} />);
    const user = userEvent.setup();
    await user.click(screen.getByRole("button", { name: "Done" }));
    const view = await waitFor(() =>
      expectChangedElsewhere("the request “fit the timing gear they brought”"),
    );
    expect(view.textContent).toContain("Saved now: Done.");
    expect(screen.getByTestId("requests-error").textContent).toBe("");
    // The list still shows what the machinist saw until they ask for the latest.
    expect(screen.getByTestId("requests-open-count").textContent).toContain("1 open");

    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
    expect(screen.getByTestId("requests-open-count").textContent).toBe("All done or explained.");
  });

  it("another 409, a rule, keeps its own words", async () => {
    stubApi(() => ({
      status: 409,
      body: { error: { code: "conflict", message: "That request is already closed." } },
    }));
    render(<BuildRequests jobId={9} role="machinist" initial={[request("open", 6)]} />);
    await userEvent.setup().click(screen.getByRole("button", { name: "Done" }));
    await waitFor(() =>
      expect(screen.getByTestId("requests-error").textContent).toBe(
        "That request is already closed.",
      ),
    );
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
  });
});

describe("price list row", () => {
  const price: PriceItem = {
    id: 3,
    code: "BAL-V8",
    description: "Balance a V8 rotating assembly",
    kind: "balancing-by-layout",
    unitPrice: "420.00",
    unit: "each",
    active: true,
    version: 6,
    updatedAt: "2026-12-01T00:00:00Z",
  };

  const renderRow = () =>
    render(
      <table>
        <tbody>
          <PriceRow price={price} />
        </tbody>
      </table>,
    );

  it("a stale save shows the one view; Load the latest refreshes the page's prices", async () => {
    priceUpdate.mockReturnValue({
      ok: false,
      status: 409,
      code: "stale_write",
      message: "price was changed by someone else (now at version 7)",
    });
    renderRow();
    const user = userEvent.setup();
    await user.click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() => expectChangedElsewhere("the price BAL-V8"));
    await user.click(screen.getByRole("button", { name: "Load the latest" }));
    expect(refresh).toHaveBeenCalledOnce();
  });

  it("a rule refusal (409 conflict) keeps its own words", async () => {
    priceUpdate.mockReturnValue({
      ok: false,
      status: 409,
      code: "conflict",
      message: "Another price already uses the code BAL-V8.",
    });
    renderRow();
    await userEvent.setup().click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() =>
      expect(screen.getByText("Another price already uses the code BAL-V8.")).toBeTruthy(),
    );
    expect(screen.queryByTestId("changed-elsewhere")).toBeNull();
  });
});
