import { renderToStaticMarkup } from "react-dom/server";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import PayReturnPage from "@/app/pay/return/page";
import type { DB } from "@/db/client";
import { insertUnappliedPayment } from "@/db/payments";
import { recordManualPayment } from "@/lib/billing/payments";
import { type BillingWorld, issueBalancingInvoice, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";
import { signInAs } from "../helpers/session";
import { storeSession } from "./support";

// The page re-reads itself while a notice is awaited; that needs the app router, not rendered here.
vi.mock("@/components/billing/refresh-while-waiting", () => ({ RefreshWhileWaiting: () => null }));

// The page a customer lands on after paying online must not say their payment paid the invoice
// when it was received but held for the shop to apply or refund.

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

afterEach(() => vi.restoreAllMocks());

const issued = (jobId = w.job.id) => issueBalancingInvoice(db, w, jobId); // 342.00

function hold(invoiceId: number, sessionId: string, reason: string, amount = "342.00") {
  return insertUnappliedPayment(db, {
    eventId: `evt_${sessionId}`,
    sessionId,
    invoiceId,
    amount,
    currency: "USD",
    reason,
    reference: "pi_test_held",
    receivedAt: new Date().toISOString(),
  });
}

async function returnPage(invoiceId: number, sessionId: string) {
  return renderToStaticMarkup(
    await PayReturnPage({
      searchParams: Promise.resolve({
        invoice: String(invoiceId),
        result: "success",
        session_id: sessionId,
      }),
    }),
  );
}

describe("the customer's return page when their payment is held to reconcile", () => {
  it("says the payment was received and held for the shop, not that the invoice is paid", async () => {
    const invoice = await issued();
    await storeSession(db, invoice.id, "342.00", "cs_test_held");
    // Cash taken meanwhile: 342.00 − 10.00 = 332.00 owed, so the 342.00 paid online is too much.
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "10.00" }, null);
    await hold(invoice.id, "cs_test_held", "over-owed");
    signInAs(w.users.customer);
    const html = await returnPage(invoice.id, "cs_test_held");
    expect(html).toContain('data-testid="pay-return-held"');
    expect(html).toContain("We received your payment of");
    expect(html).toContain("$342.00");
    expect(html).toContain("more than was still owed");
    expect(html).toContain("apply it to what you owe or refund it");
    expect(html).not.toContain("Not paid yet");
  });

  it("does not claim the online payment paid an invoice settled at the counter", async () => {
    const invoice = await issued();
    await storeSession(db, invoice.id, "342.00", "cs_test_twice");
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "342.00" }, null);
    await hold(invoice.id, "cs_test_twice", "invoice-settled");
    signInAs(w.users.customer);
    const html = await returnPage(invoice.id, "cs_test_twice");
    expect(html).not.toContain("Paid in full");
    expect(html).toContain("the invoice had already been paid");
  });

  it("shows nothing held for a session that belongs to another invoice", async () => {
    const mine = await issued();
    const theirs = await issued(w.otherJob.id);
    await storeSession(db, theirs.id, "342.00", "cs_test_theirs");
    await hold(theirs.id, "cs_test_theirs", "over-owed");
    signInAs(w.users.customer);
    const html = await returnPage(mine.id, "cs_test_theirs");
    expect(html).not.toContain("pay-return-held");
    expect(html).toContain("Not paid yet");
  });
});
