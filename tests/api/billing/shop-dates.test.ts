import { PDFParse } from "pdf-parse";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import InvoicesPage from "@/app/(shop)/invoices/page";
import JobBillingPage from "@/app/(shop)/jobs/[id]/billing/page";
import { GET as pdfRoute } from "@/app/api/invoices/[id]/pdf/route";
import { Providers } from "@/components/providers";
import type { DB } from "@/db/client";
import { DEFAULT_COUNTER_SETTINGS } from "@/db/counter-settings";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { freshDb } from "../../helpers/db";
import { jsonRequest, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

vi.mock("next/navigation", async (original) => ({
  ...(await original<typeof import("next/navigation")>()),
  useRouter: () => ({ refresh: () => {}, push: () => {}, replace: () => {} }),
}));

// A shop in Denver issues and is paid at 18:30 local time on 2 December 2026. Denver keeps
// Mountain Standard Time (UTC−7) in December, so the instant is 2026-12-03T01:30Z: the UTC
// calendar has already turned to the 3rd, the shop's has not (18:30 + 7 h = 01:30 next day).
const EVENING_IN_DENVER = new Date("2026-12-03T01:30:00Z");

let db: DB;
let w: BillingWorld;
let invoiceId: number;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  await updateCounterSettings(
    db,
    0,
    { ...DEFAULT_COUNTER_SETTINGS, timeZone: "America/Denver" },
    null,
  );
  const draft = await createInvoice(
    db,
    { jobId: w.job.id, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
    null,
    EVENING_IN_DENVER,
  );
  await issueInvoice(db, draft.id, null, EVENING_IN_DENVER);
  // 120.00 + 20 % tax = 144.00, paid in full the same evening.
  await recordManualPayment(
    db,
    draft.id,
    { method: "cash", amount: "144.00" },
    null,
    EVENING_IN_DENVER,
  );
  invoiceId = draft.id;
});

describe("billing dates are the shop's calendar dates", () => {
  it("on the job's billing page (issued, paid, payment received)", async () => {
    signInAs(w.users.counter);
    const page = await JobBillingPage({ params: Promise.resolve({ id: String(w.job.id) }) });
    const html = renderToStaticMarkup(createElement(Providers, null, page));
    expect(html).toContain("2026-12-02");
    expect(html).not.toContain("2026-12-03");
  });

  it("on the invoices list", async () => {
    signInAs(w.users.counter);
    const html = renderToStaticMarkup(await InvoicesPage({ searchParams: Promise.resolve({}) }));
    expect(html).toContain("2026-12-02");
    expect(html).not.toContain("2026-12-03");
  });

  it("on the invoice PDF (issued, paid stamp, payment line)", async () => {
    signInAs(w.users.customer);
    const res = await pdfRoute(
      jsonRequest("GET", `/api/invoices/${invoiceId}/pdf`),
      params({ id: String(invoiceId) }),
    );
    expect(res.status).toBe(200);
    const { text } = await new PDFParse({
      data: new Uint8Array(await res.arrayBuffer()),
    }).getText();
    // The stamp is letter-spaced ("PA I D 2 0 2 6 …"): read the text without its spaces.
    const flat = text.replace(/\s+/g, "");
    expect(flat).toContain("Issued2026-12-02");
    expect(flat).toContain("PAID2026-12-02");
    expect(flat).toContain("2026-12-02·Cash");
    expect(flat).not.toContain("2026-12-03");
  }, 30_000);
});
