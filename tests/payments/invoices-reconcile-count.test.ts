import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import InvoicesPage from "@/app/(shop)/invoices/page";
import type { DB } from "@/db/client";
import { insertUnappliedPayment, resolveUnappliedPayment } from "@/db/payments";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";
import { signInAs } from "../helpers/session";

// The invoices list tells the owner and the counter how many online payments wait for them.

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
});

function held(n: number) {
  return insertUnappliedPayment(db, {
    eventId: `evt_held_${n}`,
    sessionId: `cs_test_held_${n}`,
    invoiceId: null,
    amount: "50.00",
    currency: "USD",
    reason: "unknown-session",
    reference: null,
    receivedAt: new Date().toISOString(),
  });
}

const page = async () =>
  renderToStaticMarkup(await InvoicesPage({ searchParams: Promise.resolve({}) }));

/** The count beside the link, or null when none is shown. */
function countIn(html: string): string | null {
  const m = /data-testid="reconcile-count"[^>]*>(\d+)/.exec(html);
  return m ? m[1]! : null;
}

describe("the count of payments to reconcile beside the invoices list's link", () => {
  it("counts the open ones only, for the counter and the owner", async () => {
    await held(1);
    await held(2);
    const third = await held(3);
    await resolveUnappliedPayment(db, third.id, third.version, {
      status: "refunded",
      note: "Refunded at the provider",
      paymentId: null,
      resolvedBy: w.users.owner.id,
      resolvedAt: new Date().toISOString(),
    });
    // Three received, one refunded: 3 − 1 = 2 still to reconcile.
    signInAs(w.users.counter);
    expect(countIn(await page())).toBe("2");
    signInAs(w.users.owner);
    expect(countIn(await page())).toBe("2");
  });

  it("shows no count when nothing waits, and neither link nor count to a customer", async () => {
    signInAs(w.users.counter);
    const none = await page();
    expect(none).toContain('data-testid="reconcile-link"');
    expect(countIn(none)).toBeNull();

    await held(1);
    signInAs(w.users.customer);
    const theirs = await page();
    expect(theirs).not.toContain("reconcile-link");
    expect(countIn(theirs)).toBeNull();
  });
});
