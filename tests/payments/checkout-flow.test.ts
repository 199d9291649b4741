import type { Server } from "node:http";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as checkoutRoute } from "@/app/api/invoices/[id]/checkout/route";
import PayReturnPage from "@/app/pay/return/page";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import { listPaymentsForInvoice } from "@/db/payments";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { resetEnvCache } from "@/lib/env";
import { resetStripeClient } from "@/lib/payments/stripe";
import { type FakePayments, startFakePayments } from "@/scripts/fake-payments";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";
import { jsonRequest, params } from "../helpers/http";
import { signInAs } from "../helpers/session";
import { startWebhookAdapter, TEST_WEBHOOK_SECRET } from "./support";

let fake: FakePayments;
let adapter: Server;
let db: DB;
let w: BillingWorld;

beforeAll(async () => {
  const hook = await startWebhookAdapter();
  adapter = hook.server;
  fake = await startFakePayments({
    port: 0,
    webhookUrl: hook.url,
    webhookSecret: TEST_WEBHOOK_SECRET,
  });
  vi.stubEnv("STRIPE_API_BASE", fake.url);
  resetEnvCache();
  resetStripeClient();
});

afterAll(async () => {
  await fake.stop();
  await new Promise((r) => adapter.close(r));
  vi.unstubAllEnvs();
  resetEnvCache();
  resetStripeClient();
});

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => vi.mocked(console.info).mockRestore());

async function issued(jobId = w.job.id) {
  const draft = await createInvoice(
    db,
    { jobId, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    null,
  );
  return issueInvoice(db, draft.id, null); // 342.00
}

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
    expect(body.url).toBe(`${fake.url}/pay/${body.sessionId}`);
    expect(body.sessionId).toMatch(/^cs_test_/);

    const page = await (await fetch(body.url)).text();
    expect(page).toContain("$342.00");
    expect(page).toContain(`Invoice ${invoice.number}`);

    const paid = await fetch(`${fake.url}/pay/${body.sessionId}/pay`, {
      method: "POST",
      redirect: "manual",
    });
    expect(paid.status).toBe(303);
    expect(paid.headers.get("location")).toBe(
      `http://localhost/pay/return?invoice=${invoice.id}&result=success&session_id=${body.sessionId}`,
    );
    expect(fake.deliveries.at(-1)).toMatchObject({
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
    const deliveries = fake.deliveries.length;
    await fetch(`${fake.url}/pay/${body.sessionId}/pay`, { method: "POST", redirect: "manual" });
    expect(fake.deliveries.length).toBe(deliveries);
  });

  it("leaves the invoice unpaid when the customer declines", async () => {
    const invoice = await issued();
    signInAs(w.users.customer);
    const { body } = await startCheckout(invoice.id);
    const declined = await fetch(`${fake.url}/pay/${body.sessionId}/decline`, {
      method: "POST",
      redirect: "manual",
    });
    expect(declined.status).toBe(303);
    expect(declined.headers.get("location")).toBe(
      `http://localhost/pay/return?invoice=${invoice.id}&result=cancelled`,
    );
    expect(fake.deliveries.at(-1)).toMatchObject({ type: "checkout.session.expired", status: 200 });
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
    vi.stubEnv("STRIPE_API_BASE", "http://127.0.0.1:9");
    resetEnvCache();
    resetStripeClient();
    const quiet = vi.spyOn(console, "error").mockImplementation(() => {});
    try {
      signInAs(w.users.customer);
      const { status, body } = await startCheckout(invoice.id);
      expect(status).toBe(502);
      expect(body.error.code).toBe("payment_provider");
    } finally {
      quiet.mockRestore();
      vi.stubEnv("STRIPE_API_BASE", fake.url);
      resetEnvCache();
      resetStripeClient();
    }
  });
});
