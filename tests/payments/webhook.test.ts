import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import { listPaymentEvents, listPaymentsForInvoice } from "@/db/payments";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { freshDb } from "../helpers/db";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { completedEvent, deliver } from "./support";

let db: DB;
let w: BillingWorld;
let invoiceId: number;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  const draft = await createInvoice(
    db,
    { jobId: w.job.id, lines: [{ priceItemId: w.prices.balance.id, quantity: "1" }] },
    null,
  );
  invoiceId = (await issueInvoice(db, draft.id, null)).id; // 342.00
  vi.spyOn(console, "warn").mockImplementation(() => {});
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => vi.restoreAllMocks());

const invoice = async () => (await findInvoiceById(db, invoiceId))!;

describe("the payment webhook's signature check", () => {
  it("accepts a correctly signed completed checkout and marks the invoice paid", async () => {
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)));
    expect(res).toEqual({ status: 200, body: { received: true, outcome: "paid" } });
    expect(await invoice()).toMatchObject({ status: "paid", amountPaid: "342.00" });
    expect(await listPaymentsForInvoice(db, invoiceId)).toMatchObject([
      {
        method: "online",
        amount: "342.00",
        providerSessionId: "cs_test_one",
        reference: "pi_test_one",
      },
    ]);
  });

  it("refuses an event signed with another secret: 400, logged, nothing paid", async () => {
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)), {
      secret: "whsec_wrong",
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("bad_signature");
    expect((await invoice()).status).toBe("issued");
    expect(await listPaymentEvents(db)).toMatchObject([{ outcome: "rejected", event_id: null }]);
    expect(console.warn).toHaveBeenCalledWith(expect.stringMatching(/rejected/));
  });

  it("refuses an unsigned event the same way", async () => {
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)), null);
    expect(res.status).toBe(400);
    expect((await invoice()).status).toBe("issued");
    const [logged] = await listPaymentEvents(db);
    expect(logged).toMatchObject({ outcome: "rejected" });
    expect(logged!.detail).toMatch(/^unsigned/);
  });

  it("refuses a body changed after signing", async () => {
    const signed = JSON.stringify(completedEvent(invoiceId, 100));
    const { webhookRequest } = await import("./support");
    const header = webhookRequest(signed).headers.get("stripe-signature")!;
    const tampered = signed.replace('"amount_total":100', '"amount_total":34200');
    const res = await deliver(tampered, { header });
    expect(res.status).toBe(400);
    expect((await invoice()).status).toBe("issued");
  });
});

describe("the payment webhook's idempotency", () => {
  it("changes nothing when the same event arrives twice", async () => {
    const payload = JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_same" }));
    expect((await deliver(payload)).body.outcome).toBe("paid");
    expect((await deliver(payload)).body.outcome).toBe("duplicate");
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
    expect((await invoice()).amountPaid).toBe("342.00");
  });

  it("changes nothing when another event reports the same session, or another session, for a paid invoice", async () => {
    await deliver(JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_a" })));
    const resent = await deliver(
      JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_b" })),
    );
    expect(resent.body.outcome).toBe("session-already-applied");
    const second = await deliver(
      JSON.stringify(
        completedEvent(invoiceId, 34200, { eventId: "evt_c", sessionId: "cs_test_two" }),
      ),
    );
    expect(second.body.outcome).toBe("already-settled");
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
    expect((await invoice()).amountPaid).toBe("342.00");
  });

  it("does not mark paid a session the provider reports as not yet paid", async () => {
    const res = await deliver(
      JSON.stringify(completedEvent(invoiceId, 34200, { paymentStatus: "unpaid" })),
    );
    expect(res.body.outcome).toBe("not-paid-yet");
    expect((await invoice()).status).toBe("issued");
  });

  it("does not apply a payment in another currency or for more than is owed", async () => {
    expect(
      (await deliver(JSON.stringify(completedEvent(invoiceId, 34200, { currency: "eur" })))).body
        .outcome,
    ).toBe("currency-mismatch");
    expect((await deliver(JSON.stringify(completedEvent(invoiceId, 34201)))).body.outcome).toBe(
      "amount-mismatch",
    );
    expect((await invoice()).status).toBe("issued");
  });

  it("answers 200 for an event about an invoice it does not know, and records it", async () => {
    const res = await deliver(JSON.stringify(completedEvent(9999, 100)));
    expect(res).toEqual({ status: 200, body: { received: true, outcome: "unknown-invoice" } });
    expect((await listPaymentEvents(db))[0]).toMatchObject({
      outcome: "unknown-invoice",
      invoice_id: null,
    });
  });
});
