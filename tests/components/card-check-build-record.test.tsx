// @vitest-environment jsdom
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { afterEach, describe, expect, it, vi } from "vitest";
import { CardCheckForm } from "@/components/cards/card-check-form";
import type { VerifiedBuildCard } from "@/lib/build-record/card";
import { stubApi } from "./support/stub-api";

// The public file check answering for an engine build record: what the shop issued, which
// revision of which job, and whether a newer revision has replaced it.

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const record: VerifiedBuildCard = {
  verificationCode: "7KQ2M-9XW4D",
  revision: 1,
  status: "superseded",
  latestRevision: 2,
  issuedAt: "2026-12-01T15:00:00.000Z",
  timeZone: "UTC",
  shopName: "Invented Engine Works",
  jobNumber: "2026-0042",
  engine: "Invented V8",
  sha256: "ab".repeat(32),
  tables: [{ title: "True TDC", head: ["First stop", "Second stop"], rows: [["-18", "22"]] }],
};

async function checkFile(answer: unknown) {
  stubApi(() => ({ status: 200, body: answer }));
  render(
    <QueryClientProvider client={new QueryClient()}>
      <CardCheckForm />
    </QueryClientProvider>,
  );
  const user = userEvent.setup();
  const file = new File(["%PDF-1.4"], "record.pdf", { type: "application/pdf" });
  await user.upload(screen.getByLabelText(/Balance card PDF/), file);
  // jsdom does not submit a form with a required file box on a click; the form's own submit does.
  fireEvent.submit(screen.getByRole("button", { name: "Check the file" }).closest("form")!);
  const result = screen.getByTestId("card-check-result");
  await waitFor(() => expect(result.textContent).not.toBe(""));
  return result.textContent ?? "";
}

describe("checking an engine build record PDF", () => {
  it("genuine: names the revision and job, and that revision 2 has replaced it", async () => {
    const text = await checkFile({ result: "genuine", sha256: record.sha256, buildRecord: record });
    expect(text).toContain(
      "Genuine: this file is exactly the engine build record the shop issued (code 7KQ2M-9XW4D, revision 1 of job 2026-0042).",
    );
    expect(text).toContain("replaced by revision 2");
    expect(text).toContain("True TDC");
  });

  it("altered: says not to rely on its figures", async () => {
    const text = await checkFile({
      result: "altered",
      sha256: "0".repeat(64),
      buildRecord: record,
    });
    expect(text).toContain("Altered: this file names engine build record 7KQ2M-9XW4D, revision 1");
    expect(text).toContain("Do not rely on its figures");
  });
});
