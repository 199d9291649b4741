import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import InvoicesPage from "@/app/(shop)/invoices/page";
import JobBillingPage from "@/app/(shop)/jobs/[id]/billing/page";
import PricesPage from "@/app/(shop)/prices/page";
import SettingsPage from "@/app/(shop)/settings/page";
import { Providers } from "@/components/providers";
import type { DB } from "@/db/client";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { createQuote, moveQuote } from "@/lib/billing/quotes";
import { freshDb } from "../../helpers/db";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

// The pages' client parts ask for the router; outside a running app a stand-in does.
vi.mock("next/navigation", async (original) => ({
  ...(await original<typeof import("next/navigation")>()),
  useRouter: () => ({ refresh: () => {}, push: () => {}, replace: () => {} }),
}));

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db);
});

const billingPage = async (jobId: number) =>
  renderToStaticMarkup(
    // The panel reads through TanStack Query, as under the app's layout.
    createElement(
      Providers,
      null,
      await JobBillingPage({ params: Promise.resolve({ id: String(jobId) }) }),
    ),
  );

describe("the job's billing page", () => {
  it("lets the counter start a quote and make an invoice", async () => {
    signInAs(w.users.counter);
    const html = await billingPage(w.job.id);
    expect(html).toContain("Start a quote");
    expect(html).toContain("New invoice from the price list");
  });

  it("shows the customer an offered quote to accept and an issued invoice to pay online", async () => {
    const quote = await createQuote(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    await moveQuote(db, quote.id, "offer", null);
    const draft = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
      null,
    );
    await issueInvoice(db, draft.id, null);
    await createInvoice(db, { jobId: w.job.id, lines: [] }, null); // a draft the customer must not see
    signInAs(w.users.customer);
    const html = await billingPage(w.job.id);
    expect(html).toContain("Accept this quote");
    expect(html).toContain("Pay online");
    expect(html).toContain("$144.00"); // 120.00 + 20 %
    expect(html).not.toContain("Draft invoice");
    expect(html).not.toContain("Record payment");
  });

  it("does not show the customer a quote the shop withdrew", async () => {
    const quote = await createQuote(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
      null,
    );
    await moveQuote(db, quote.id, "offer", null);
    await moveQuote(db, quote.id, "withdraw", null);
    signInAs(w.users.customer);
    const html = await billingPage(w.job.id);
    expect(html).not.toContain(quote.number);
    expect(html).toContain("The shop has not sent a quote for this job yet.");
    signInAs(w.users.counter);
    expect(await billingPage(w.job.id)).toContain(quote.number);
  });

  it("is not found for another customer's job", async () => {
    signInAs(w.otherCustomer);
    await expect(billingPage(w.job.id)).rejects.toThrow(/NEXT_HTTP_ERROR_FALLBACK;404/);
  });

  it("sends a machinist to the no-access page", async () => {
    signInAs(w.users.machinist);
    await expect(billingPage(w.job.id)).rejects.toThrow(/NEXT_REDIRECT/);
  });
});

describe("the invoices, prices and settings pages", () => {
  it("list only the customer's own issued invoices", async () => {
    for (const jobId of [w.job.id, w.otherJob.id]) {
      const d = await createInvoice(
        db,
        { jobId, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
        null,
      );
      await issueInvoice(db, d.id, null);
    }
    signInAs(w.users.customer);
    const html = renderToStaticMarkup(await InvoicesPage({ searchParams: Promise.resolve({}) }));
    expect(html).toContain("Your invoices");
    expect(html.match(/data-testid="invoice-row-/g)).toHaveLength(1);
    expect(html).toContain(w.job.number);
    expect(html).not.toContain(w.otherJob.number);
  });

  it("show the owner the price list and the settings form, and nobody else", async () => {
    signInAs(w.users.owner);
    expect(renderToStaticMarkup(await PricesPage())).toContain("BAL-I4");
    expect(renderToStaticMarkup(await SettingsPage())).toContain("Test Balancing");
    signInAs(w.users.counter);
    await expect(PricesPage()).rejects.toThrow(/NEXT_REDIRECT/);
    await expect(SettingsPage()).rejects.toThrow(/NEXT_REDIRECT/);
  });
});
