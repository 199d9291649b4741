import path from "node:path";
import { expect, test } from "@playwright/test";
import SQLite from "better-sqlite3";
import Stripe from "stripe";
import { bookJobForNewCustomer, DEMO_EMAIL, DEMO_PASSWORD, signInAs } from "./helpers";
import { signInOverHttp } from "./support/http-session";
import { ROOT } from "./support/app-server";

// Online payments over real HTTP against `next start` and the local payment fake
// (scripts/e2e-server.ts): one page per invoice and amount, payments that no longer fit kept to
// reconcile, and the webhook trusting only signed notices about sessions we opened.
// Demo price list and tax (lib/billing/demo.ts): BAL-V8 395.00, tax 8.25 % on the subtotal,
// rounded half-up to cents once: 395.00 × 0.0825 = 32.5875 → 32.59; total 427.59.
// After 10.00 cash at the counter: 427.59 − 10.00 = 417.59 still owed.

const PORT = Number(process.env.E2E_PORT ?? 3100);
const DATA = path.join(ROOT, "data", PORT === 3100 ? "e2e" : `e2e-${PORT}`);
const FAKE = `http://127.0.0.1:${PORT + 1242}`;
/** The webhook secret scripts/e2e-server.ts gives the app and the fake (test keys only). */
const WEBHOOK_SECRET = "whsec_local";

type Json = Record<string, unknown> & { error?: { code: string; message: string } };

/** A counter's session and a JSON caller over HTTP. */
async function desk(baseURL: string) {
  const { cookie } = await signInOverHttp(baseURL, DEMO_EMAIL.counter, DEMO_PASSWORD);
  return async (method: "GET" | "POST", url: string, body?: unknown) => {
    const res = await fetch(`${baseURL}${url}`, {
      method,
      headers: { cookie, ...(body === undefined ? {} : { "content-type": "application/json" }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: res.status, body: (await res.json()) as Json };
  };
}

/** A job of the spec's own with an issued invoice for BAL-V8 (427.59). */
async function issuedInvoice(baseURL: string, api: Awaited<ReturnType<typeof desk>>) {
  const job = await bookJobForNewCustomer(baseURL, `Payments edge ${Date.now().toString(36)}`, {
    engine: "Cross-plane V8 for a payment check",
    spec: { layout: "v8-cross-plane", cylinders: 8 },
  });
  const prices = (await api("GET", "/api/prices?active=1")).body.prices as {
    id: number;
    code: string;
  }[];
  const balance = prices.find((p) => p.code === "BAL-V8")!;
  const draft = await api("POST", "/api/invoices", {
    jobId: job.id,
    lines: [{ priceItemId: balance.id, quantity: "1" }],
  });
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  const id = (draft.body.invoice as { id: number }).id;
  const issued = await api("POST", `/api/invoices/${id}/issue`);
  expect(issued.status, JSON.stringify(issued.body)).toBe(200);
  const invoice = issued.body.invoice as { id: number; number: string; total: string };
  expect(invoice.total).toBe("427.59");
  return { job, invoice };
}

/** Presses Pay on the fake's hosted page (it sends the signed notice before it answers). */
const pay = (sessionId: string) =>
  fetch(`${FAKE}/pay/${sessionId}/pay`, { method: "POST", redirect: "manual" });

function countRows(table: string): number {
  const db = new SQLite(path.join(DATA, "counterpoise.db"), { readonly: true });
  try {
    return (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n;
  } finally {
    db.close();
  }
}

function signedPost(baseURL: string, event: unknown, secret = WEBHOOK_SECRET) {
  const payload = JSON.stringify(event);
  return fetch(`${baseURL}/api/payments/webhook`, {
    method: "POST",
    headers: {
      "content-type": "application/json",
      "stripe-signature": Stripe.webhooks.generateTestHeaderString({ payload, secret }),
    },
    body: payload,
  });
}

/** A paid checkout.session.completed event naming `invoiceId`, for session `sessionId`. */
function paidEvent(sessionId: string, invoiceId: number, cents: number) {
  return {
    id: `evt_edge_${Math.random().toString(36).slice(2)}`,
    object: "event",
    type: "checkout.session.completed",
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    data: {
      object: {
        id: sessionId,
        object: "checkout.session",
        amount_total: cents,
        currency: "usd",
        payment_status: "paid",
        status: "complete",
        payment_intent: `pi_edge_${Math.random().toString(36).slice(2)}`,
        client_reference_id: String(invoiceId),
        metadata: { invoiceId: String(invoiceId) },
      },
    },
  };
}

test("a second checkout for the same invoice and amount reuses the open payment page; paying it twice takes one payment", async ({
  baseURL,
}) => {
  const api = await desk(baseURL!);
  const { invoice } = await issuedInvoice(baseURL!, api);
  const first = await api("POST", `/api/invoices/${invoice.id}/checkout`);
  const second = await api("POST", `/api/invoices/${invoice.id}/checkout`);
  expect(first.status).toBe(201);
  expect(second.body).toEqual(first.body); // the same page, so the customer is charged once
  const sessionId = first.body.sessionId as string;
  await pay(sessionId);
  await pay(sessionId);
  const payments = await api("GET", `/api/invoices/${invoice.id}/payments`);
  expect(payments.body.payments).toHaveLength(1);
  expect((await api("GET", `/api/invoices/${invoice.id}`)).body.invoice).toMatchObject({
    status: "paid",
    amountPaid: "427.59",
  });
  expect(
    (await api("GET", `/api/payments/unapplied?invoiceId=${invoice.id}&status=all`)).body.payments,
  ).toEqual([]);
});

test("cash at the counter closes the open payment page; a payment on it arriving after is kept to reconcile, shown on the invoice and refunded from there", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);
  const api = await desk(baseURL!);
  const { job, invoice } = await issuedInvoice(baseURL!, api);
  const old = await api("POST", `/api/invoices/${invoice.id}/checkout`);
  const cash = await api("POST", `/api/invoices/${invoice.id}/payments`, {
    method: "cash",
    amount: "10.00",
  });
  expect(cash.status).toBe(201);
  // The cash closed the old page at the provider at once: pressing Pay on it takes nothing.
  const oldId = old.body.sessionId as string;
  const atProvider = await fetch(`${FAKE}/v1/checkout/sessions/${oldId}`, {
    headers: { authorization: "Bearer sk_test_local" },
  });
  expect(((await atProvider.json()) as { status: string }).status).toBe("expired");
  await pay(oldId);
  expect((await api("GET", `/api/invoices/${invoice.id}/payments`)).body.payments).toHaveLength(1);

  // Paid on that page just before it closed, its notice arriving after the cash: 427.59 where
  // 417.59 is owed, kept to reconcile and listed.
  const late = await signedPost(baseURL!, paidEvent(oldId, invoice.id, 42759));
  expect(await late.json()).toMatchObject({ outcome: "to-reconcile", reason: "session-closed" });
  const kept = await api("GET", `/api/payments/unapplied?invoiceId=${invoice.id}`);
  expect(kept.body.payments).toMatchObject([
    { amount: "427.59", currency: "USD", reason: "session-closed", status: "open" },
  ]);
  expect((await api("GET", `/api/invoices/${invoice.id}`)).body.invoice).toMatchObject({
    amountPaid: "10.00",
    status: "issued",
  });

  // A new checkout asks for what is owed now, on a new page.
  const fresh = await api("POST", `/api/invoices/${invoice.id}/checkout`);
  expect(fresh.body).toMatchObject({ amount: "417.59" });
  expect(fresh.body.sessionId).not.toBe(old.body.sessionId);

  // The counter sees it on the invoice, cannot apply it (more than is owed), and refunds it.
  await signInAs(page, "counter");
  await page.goto(`${job.path}/billing`);
  const card = page.getByTestId(`invoice-${invoice.id}`);
  const banner = card.getByTestId("unapplied-payment-banner");
  await expect(banner).toContainText(
    "A payment of $427.59 was received online and not applied: refund it or apply it.",
  );
  await banner.getByRole("button", { name: "Apply as payment" }).click();
  await expect(banner).toContainText(
    `$427.59 is more than the $417.59 still owed on ${invoice.number}: refund it.`,
  );
  await banner.getByRole("button", { name: "Mark refunded" }).click();
  await banner
    .getByLabel("What was done (refund reference, or why)")
    .fill("Refunded at the payment service, ref re_edge_1");
  await banner.getByRole("button", { name: "Save as refunded" }).click();
  await expect(card.getByTestId("unapplied-payment-message")).toHaveText("Marked refunded.");
  await expect(card.getByTestId("unapplied-payment-banner")).toHaveCount(0);

  await page.goto("/invoices/reconcile?status=refunded");
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Online payments to reconcile");
  const item = page.getByTestId(
    `unapplied-payment-${(kept.body.payments as { id: number }[])[0]!.id}`,
  );
  await expect(item).toContainText("Refunded at the payment service, ref re_edge_1");
  await expect(item.getByRole("link", { name: invoice.number })).toBeVisible();
});

test("an unsigned or badly signed webhook post is refused before anything is written", async ({
  baseURL,
}) => {
  const before = countRows("payment_events");
  const body = JSON.stringify(paidEvent("cs_edge_forged", 1, 100));
  const unsigned = await fetch(`${baseURL}/api/payments/webhook`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body,
  });
  expect(unsigned.status).toBe(400);
  const badlySigned = await signedPost(
    baseURL!,
    paidEvent("cs_edge_forged", 1, 100),
    "whsec_guess",
  );
  expect(badlySigned.status).toBe(400);
  expect(((await badlySigned.json()) as Json).error?.code).toBe("bad_signature");
  // Neither stored a payment_events row: anyone could otherwise fill the table.
  expect(countRows("payment_events")).toBe(before);
});

test("the webhook checks the payment session it refers to, never paying the invoice the event names", async ({
  baseURL,
}) => {
  const api = await desk(baseURL!);
  const a = await issuedInvoice(baseURL!, api);
  const b = await issuedInvoice(baseURL!, api);
  const opened = await api("POST", `/api/invoices/${a.invoice.id}/checkout`);

  // A session we never opened, naming invoice B, for a token amount.
  const stray = await signedPost(baseURL!, paidEvent("cs_edge_not_ours", b.invoice.id, 100));
  expect(await stray.json()).toEqual({
    received: true,
    outcome: "to-reconcile",
    reason: "unknown-session",
  });
  // Invoice A's session, naming invoice B.
  const crossed = await signedPost(
    baseURL!,
    paidEvent(opened.body.sessionId as string, b.invoice.id, 42759),
  );
  expect(await crossed.json()).toMatchObject({
    outcome: "to-reconcile",
    reason: "invoice-mismatch",
  });

  for (const { invoice } of [a, b]) {
    expect((await api("GET", `/api/invoices/${invoice.id}`)).body.invoice).toMatchObject({
      status: "issued",
      amountPaid: "0.00",
    });
  }
  const listed = (await api("GET", "/api/payments/unapplied")).body.payments as {
    sessionId: string;
    invoiceId: number | null;
  }[];
  expect(listed.find((p) => p.sessionId === "cs_edge_not_ours")).toMatchObject({ invoiceId: null });
  expect(listed.find((p) => p.sessionId === opened.body.sessionId)).toMatchObject({
    invoiceId: a.invoice.id,
  });
});
