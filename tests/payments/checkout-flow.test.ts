import { renderToStaticMarkup } from "react-dom/server";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as checkoutRoute } from "@/app/api/invoices/[id]/checkout/route";
import PayReturnPage from "@/app/pay/return/page";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import { listPaymentsForInvoice, listUnappliedPayments } from "@/db/payments";
import { createInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { resetEnvCache } from "@/lib/env";
import { stripeClient } from "@/lib/payments/stripe";
import { type BillingWorld, issueBalancingInvoice, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";
import { startProviderFakeForFile } from "./support";

const provider = startProviderFakeForFile();
const { atProvider, pay } = provider;
let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  vi.spyOn(console, "info").mockImplementation(() => {});
  vi.spyOn(console, "warn").mockImplementation(() => {});
});

afterEach(() => vi.restoreAllMocks());

const issued = (jobId = w.job.id) => issueBalancingInvoice(db, w, jobId); // 342.00

async function startCheckout(invoiceId: number) {
  const res = await checkoutRoute(
    jsonRequest("POST", `/api/invoices/${invoiceId}/checkout`),
    params({ id: String(invoiceId) }),
  );
  return { status: res.status, body: await res.json() };
}

describe("paying an invoice online through the SDK and the local fake", () => {
  it("opens a session for what is owed, and the signed notice after Pay marks the invoice paid", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const { status, body } = await startCheckout(invoice.id);
    expect(status).toBe(201);
    expect(body).toMatchObject({ amount: "342.00", currency: "USD" });
    expect(body.url).toBe(`${provider.fake.url}/pay/${body.sessionId}`);
    expect(body.sessionId).toMatch(/^cs_test_/);

    const page = await (await fetch(body.url)).text();
    expect(page).toContain("$342.00");
    expect(page).toContain(`Invoice ${invoice.number}`);

    const paid = await fetch(`${provider.fake.url}/pay/${body.sessionId}/pay`, {
      method: "POST",
      redirect: "manual",
    });
    expect(paid.status).toBe(303);
    expect(paid.headers.get("location")).toBe(
      `http://localhost/pay/return?invoice=${invoice.id}&result=success&session_id=${body.sessionId}`,
    );
    expect(provider.fake.deliveries.at(-1)).toMatchObject({
      type: "checkout.session.completed",
      status: 200,
    });
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({
      status: "paid",
      amountPaid: "342.00",
    });
    expect(await listPaymentsForInvoice(db, invoice.id)).toMatchObject([
      { method: "online", amount: "342.00", providerSessionId: body.sessionId },
    ]);

    // The page people land on reads the database, not the redirect.
    const html = renderToStaticMarkup(
      await PayReturnPage({
        searchParams: Promise.resolve({ invoice: String(invoice.id), result: "success" }),
      }),
    );
    expect(html).toContain("Paid in full");

    // Pressing Pay again on a finished session sends nothing more.
    const deliveries = provider.fake.deliveries.length;
    await fetch(`${provider.fake.url}/pay/${body.sessionId}/pay`, {
      method: "POST",
      redirect: "manual",
    });
    expect(provider.fake.deliveries.length).toBe(deliveries);
  });

  it("leaves the invoice unpaid when the customer declines", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const { body } = await startCheckout(invoice.id);
    const declined = await fetch(`${provider.fake.url}/pay/${body.sessionId}/decline`, {
      method: "POST",
      redirect: "manual",
    });
    expect(declined.status).toBe(303);
    expect(declined.headers.get("location")).toBe(
      `http://localhost/pay/return?invoice=${invoice.id}&result=cancelled`,
    );
    expect(provider.fake.deliveries.at(-1)).toMatchObject({
      type: "checkout.session.expired",
      status: 200,
    });
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({
      status: "issued",
      amountPaid: "0.00",
    });
    const session = await db
      .selectFrom("payment_sessions")
      .select("status")
      .where("id", "=", body.sessionId)
      .executeTakeFirstOrThrow();
    expect(session.status).toBe("expired");
    const html = renderToStaticMarkup(
      await PayReturnPage({
        searchParams: Promise.resolve({ invoice: String(invoice.id), result: "cancelled" }),
      }),
    );
    expect(html).toContain("nothing was taken");
  });

  it("lets a customer pay only their own invoices: another customer's is a 404", async () => {
    const theirs = await issued(w.otherJob.id);
    signInAs(w.users.customer);
    expect((await startCheckout(theirs.id)).status).toBe(404);
    signInAs(w.otherCustomer);
    expect((await startCheckout(theirs.id)).status).toBe(201);
  });

  it("lets the counter open the payment page but not the machinist, and refuses drafts and paid invoices", async () => {
    const invoice = await issued();
    signInAs(w.users.machinist);
    expect((await startCheckout(invoice.id)).status).toBe(403);
    signInAs(w.users.counter);
    expect((await startCheckout(invoice.id)).status).toBe(201);

    const draft = await createInvoice(
      db,
      { jobId: w.job.id, lines: [{ priceItemId: w.prices.rush.id, quantity: "1" }] },
      null,
    );
    expect((await startCheckout(draft.id)).status).toBe(409);
    signInAs(w.users.customer);
    expect((await startCheckout(draft.id)).status).toBe(404);
  });

  it("answers 502 when the payment service cannot be reached", async () => {
    const invoice = await issued();
    provider.pointAt("http://127.0.0.1:9");
    const quiet = vi.spyOn(console, "error").mockImplementation(() => {});
    try {
      signInAs(w.users.customer);
      const { status, body } = await startCheckout(invoice.id);
      expect(status).toBe(502);
      expect(body.error.code).toBe("payment_provider");
    } finally {
      quiet.mockRestore();
    }
  });
});

const sessionRows = (invoiceId: number) =>
  db
    .selectFrom("payment_sessions")
    .select(["id", "status", "amount"])
    .where("invoice_id", "=", invoiceId)
    .orderBy("created_at")
    .execute();

describe("one payment page per invoice and amount", () => {
  it("offers the same page to a second checkout for the same amount, so the customer pays once", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const first = await startCheckout(invoice.id);
    signInAs(w.users.counter);
    const second = await startCheckout(invoice.id);
    expect(second.status).toBe(201);
    expect(second.body).toEqual(first.body);
    expect(await sessionRows(invoice.id)).toEqual([
      { id: first.body.sessionId, status: "open", amount: "342.00" },
    ]);

    await pay(first.body.sessionId);
    const deliveries = provider.fake.deliveries.length;
    await pay(second.body.sessionId); // the same page: already paid, nothing more is taken
    expect(provider.fake.deliveries.length).toBe(deliveries);
    expect(await listPaymentsForInvoice(db, invoice.id)).toHaveLength(1);
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({ status: "paid" });
    // Paid: no page is offered any more.
    expect((await startCheckout(invoice.id)).status).toBe(409);
  });

  it("closes the old page at the provider and opens one for the new amount once cash was taken", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const old = await startCheckout(invoice.id);
    // 342.00 − 10.00 cash = 332.00 still owed.
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "10.00" }, null);
    const fresh = await startCheckout(invoice.id);
    expect(fresh.status).toBe(201);
    expect(fresh.body).toMatchObject({ amount: "332.00", currency: "USD" });
    expect(fresh.body.sessionId).not.toBe(old.body.sessionId);
    expect((await atProvider(old.body.sessionId)).status).toBe("expired");
    expect(await atProvider(fresh.body.sessionId)).toMatchObject({
      status: "open",
      amount_total: 33200,
    });
    expect(await sessionRows(invoice.id)).toEqual([
      { id: old.body.sessionId, status: "expired", amount: "342.00" },
      { id: fresh.body.sessionId, status: "open", amount: "332.00" },
    ]);
    // The closed page takes no money.
    const deliveries = provider.fake.deliveries.length;
    await pay(old.body.sessionId);
    expect(provider.fake.deliveries.length).toBe(deliveries);
  });

  it("keeps to reconcile a payment on the old page made after cash was taken, and opens a new one", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const old = await startCheckout(invoice.id);
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "10.00" }, null);
    await pay(old.body.sessionId); // 342.00 taken where 332.00 is owed
    expect(provider.fake.deliveries.at(-1)).toMatchObject({
      type: "checkout.session.completed",
      status: 200,
    });
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({ amountPaid: "10.00" });
    expect(await listUnappliedPayments(db, { invoiceId: invoice.id })).toMatchObject([
      { amount: "342.00", reason: "over-owed", status: "open", sessionId: old.body.sessionId },
    ]);
    const fresh = await startCheckout(invoice.id);
    expect(fresh.body).toMatchObject({ amount: "332.00" });
    expect(fresh.body.sessionId).not.toBe(old.body.sessionId);
  });

  it("opens one page when two checkouts start at once, and closes the other at the provider", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    // Both reach the provider before either stores its page (as two requests on two app servers
    // can): each opens one there, and the second to store must find the first's.
    const sessions = stripeClient().checkout.sessions;
    const create = sessions.create.bind(sessions);
    let arrived = 0;
    let release = () => {};
    const bothThere = new Promise<void>((resolve) => (release = resolve));
    vi.spyOn(sessions, "create").mockImplementation(async (...args) => {
      arrived += 1;
      if (arrived === 2) release();
      await bothThere;
      return create(...args);
    });
    const created = provider.fake.deliveries.length;
    const [a, b] = await Promise.all([startCheckout(invoice.id), startCheckout(invoice.id)]);
    expect(arrived).toBe(2);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.url).toBe(b.body.url);
    expect(await sessionRows(invoice.id)).toEqual([
      { id: a.body.sessionId, status: "open", amount: "342.00" },
    ]);
    // The loser's page was opened at the provider and closed again there.
    const closed = provider.fake.deliveries
      .slice(created)
      .filter((d) => d.type === "checkout.session.expired");
    expect(closed).toHaveLength(1);
    expect(closed[0]!.sessionId).not.toBe(a.body.sessionId);
    expect((await atProvider(closed[0]!.sessionId)).status).toBe("expired");
  });

  it("does not offer again a page about to lapse at the provider", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const old = await startCheckout(invoice.id);
    await db
      .updateTable("payment_sessions")
      .set({ expires_at: new Date(Date.now() + 5 * 60_000).toISOString() })
      .where("id", "=", old.body.sessionId)
      .execute();
    const fresh = await startCheckout(invoice.id);
    expect(fresh.body.sessionId).not.toBe(old.body.sessionId);
    expect((await atProvider(old.body.sessionId)).status).toBe("expired");
  });
});

describe("a page paid while its notice is still on the way", () => {
  it("stops a new checkout (409) instead of opening a second page beside a payment being made", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const old = await startCheckout(invoice.id);
    // The notice does not get through (our webhook checks another secret), so the page is paid
    // at the provider and still open on our side.
    vi.stubEnv("STRIPE_WEBHOOK_SECRET", "whsec_not_the_fakes");
    resetEnvCache();
    try {
      await pay(old.body.sessionId);
      expect(provider.fake.deliveries.at(-1)).toMatchObject({
        sessionId: old.body.sessionId,
        status: 400,
      });
    } finally {
      vi.unstubAllEnvs();
      vi.stubEnv("STRIPE_API_BASE", provider.fake.url);
      resetEnvCache();
    }
    await recordManualPayment(db, invoice.id, { method: "cash", amount: "10.00" }, null);
    const res = await startCheckout(invoice.id);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("payment_in_progress");
    expect(await sessionRows(invoice.id)).toEqual([
      { id: old.body.sessionId, status: "open", amount: "342.00" },
    ]);
  });
});
