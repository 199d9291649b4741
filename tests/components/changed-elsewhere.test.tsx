// @vitest-environment jsdom
import { cleanup, render, screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import { ApiError } from "@/lib/api-client";

afterEach(cleanup);

// The bodies are what lib/http/to-error-body.ts answers for a StaleWriteError and for rule refusals.
const stale = new ApiError(409, {
  error: { code: "stale_write", message: "job was changed by someone else (now at version 4)" },
  currentVersion: 4,
});

describe("isStaleWrite", () => {
  it("is true for a 409 stale write in our error shape", () => {
    expect(isStaleWrite(stale)).toBe(true);
  });

  it("is false for a 409 that is a rule, not a change elsewhere", () => {
    const rule = new ApiError(409, {
      error: { code: "last_owner", message: "The shop needs at least one active owner." },
    });
    expect(isStaleWrite(rule)).toBe(false);
  });

  it("is false for other statuses, other errors and bodies without our shape", () => {
    expect(isStaleWrite(new ApiError(422, { error: { code: "stale_write", message: "x" } }))).toBe(
      false,
    );
    expect(isStaleWrite(new Error("409"))).toBe(false);
    expect(isStaleWrite({ status: 409, body: { error: { code: "stale_write" } } })).toBe(false);
    expect(isStaleWrite(new ApiError(409, {} as never))).toBe(false);
  });
});

describe("ChangedElsewhere", () => {
  it("names what changed and offers one button that loads the latest", async () => {
    const reload = vi.fn();
    render(<ChangedElsewhere what="this job's settings" onReload={reload} />);
    expect(screen.getByTestId("changed-elsewhere").textContent).toContain(
      "someone else changed this job's settings since this page loaded",
    );
    const buttons = screen.getAllByRole("button");
    expect(buttons).toHaveLength(1);
    await userEvent.click(buttons[0]!);
    expect(reload).toHaveBeenCalledOnce();
  });

  it("is reached and used from the keyboard", async () => {
    const reload = vi.fn();
    render(
      <>
        <input aria-label="before" />
        <ChangedElsewhere what="the record" onReload={reload} />
      </>,
    );
    const user = userEvent.setup();
    await user.click(screen.getByLabelText("before"));
    await user.tab();
    expect(document.activeElement).toBe(screen.getByRole("button", { name: "Load the latest" }));
    await user.keyboard("{Enter}");
    expect(reload).toHaveBeenCalledOnce();
  });

  it("shows what the refusal says is saved now, in words", () => {
    const withWords = new ApiError(409, {
      error: { code: "stale_write", message: "weight was changed by someone else" },
      currentVersion: 4,
      current: "499.0 g",
    });
    render(<ChangedElsewhere what="the record" onReload={() => {}} error={withWords} />);
    expect(screen.getByTestId("changed-elsewhere").textContent).toContain("Saved now: 499.0 g.");
  });

  it("never shows the stored version number, an internal count, to a person", () => {
    render(<ChangedElsewhere what="the record" onReload={() => {}} error={stale} />);
    const text = screen.getByTestId("changed-elsewhere").textContent ?? "";
    expect(text).not.toContain("version");
    expect(text).not.toMatch(/\b4\b/);
    expect(text).not.toContain("Saved now");
  });

  it("prefers what the screen knows is saved now, and says nothing when neither knows", () => {
    const { rerender } = render(
      <ChangedElsewhere
        what="cylinder 1 piston"
        onReload={() => {}}
        error={stale}
        current="499.0 g"
      />,
    );
    expect(screen.getByTestId("changed-elsewhere").textContent).toContain("Saved now: 499.0 g.");
    rerender(<ChangedElsewhere what="cylinder 1 piston" onReload={() => {}} />);
    expect(screen.getByTestId("changed-elsewhere").textContent).not.toContain("Saved now");
  });

  it("keeps the button still while the latest is loading", () => {
    render(<ChangedElsewhere what="the record" onReload={() => {}} loading />);
    expect(screen.getByRole("button", { name: "Loading…" })).toHaveProperty("disabled", true);
  });
});
