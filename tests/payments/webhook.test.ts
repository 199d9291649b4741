import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import {
  listPaymentEvents,
  listPaymentsForInvoice,
  listUnappliedPayments,
  markPaymentSessionExpired,
} from "@/db/payments";
import { voidInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { rejectedNotificationCount } from "@/lib/payments/webhook";
import { freshDb } from "../helpers/db";
import { type BillingWorld, issueBalancingInvoice, setUpBilling } from "../api/billing/fixtures";
import { completedEvent, deliver, storeSession, webhookRequest } from "./support";

// The invoice: BAL-I4 285.00 + 20 % tax 57.00 = 342.00 (34200 cents at the provider).

let db: DB;
let w: BillingWorld;
let invoiceId: number;

const issued = async (jobId: number) => (await issueBalancingInvoice(db, w, jobId)).id;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db, "20");
  invoiceId = await issued(w.job.id); // 342.00
  await storeSession(db, invoiceId, "342.00"); // cs_test_one, the page opened for it
  vi.spyOn(console, "warn").mockImplementation(() => {});
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => vi.restoreAllMocks());

const invoice = async (id = invoiceId) => (await findInvoiceById(db, id))!;
const tableRows = async (table: "payment_events" | "payments" | "unapplied_payments") =>
  Number(
    (
      await db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll<number | string>().as("n"))
        .executeTakeFirstOrThrow()
    ).n,
  );

describe("the payment webhook's signature check", () => {
  it("accepts a correctly signed completed checkout for our open session and marks the invoice paid", async () => {
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

  it("refuses an event signed with another secret: 400, counted and logged, and nothing written", async () => {
    const before = rejectedNotificationCount();
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)), {
      secret: "whsec_wrong",
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("bad_signature");
    expect((await invoice()).status).toBe("issued");
    // Anyone can post here: a refusal must cost no row (before, each one stored an event).
    expect(await tableRows("payment_events")).toBe(0);
    expect(rejectedNotificationCount()).toBe(before + 1);
    expect(console.warn).toHaveBeenCalledWith(expect.stringMatching(/rejected.*bad signature/));
  });

  it("refuses an unsigned event the same way, writing nothing", async () => {
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)), null);
    expect(res.status).toBe(400);
    expect((await invoice()).status).toBe("issued");
    expect(await tableRows("payment_events")).toBe(0);
    expect(console.warn).toHaveBeenCalledWith(expect.stringMatching(/rejected.*unsigned/));
  });

  it("refuses a body changed after signing", async () => {
    const signed = JSON.stringify(completedEvent(invoiceId, 100));
    const header = webhookRequest(signed).headers.get("stripe-signature")!;
    const tampered = signed.replace('"amount_total":100', '"amount_total":34200');
    const res = await deliver(tampered, { header });
    expect(res.status).toBe(400);
    expect((await invoice()).status).toBe("issued");
    expect(await tableRows("payment_events")).toBe(0);
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

  it("takes one payment when the same event is delivered twice at once", async () => {
    const payload = JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_twice" }));
    const outcomes = (await Promise.all([deliver(payload), deliver(payload)])).map(
      (r) => r.body.outcome,
    );
    expect(outcomes.sort()).toEqual(["duplicate", "paid"]);
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
    expect(await tableRows("unapplied_payments")).toBe(0);
    expect((await invoice()).amountPaid).toBe("342.00");
  });

  it("takes one payment when two events for the same session arrive at once", async () => {
    const [a, b] = await Promise.all([
      deliver(JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_a" }))),
      deliver(JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_b" }))),
    ]);
    expect([a.body.outcome, b.body.outcome].sort()).toEqual(["paid", "session-already-applied"]);
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
    expect(await tableRows("unapplied_payments")).toBe(0);
  });

  it("does not mark paid a session the provider reports as not yet paid", async () => {
    const res = await deliver(
      JSON.stringify(completedEvent(invoiceId, 34200, { paymentStatus: "unpaid" })),
    );
    expect(res.body.outcome).toBe("not-paid-yet");
    expect((await invoice()).status).toBe("issued");
    expect(await tableRows("unapplied_payments")).toBe(0);
  });
});

describe("money the webhook does not apply is kept to reconcile, never lost", () => {
  it("keeps a second payment for an invoice already paid (paid twice), once", async () => {
    await storeSession(db, invoiceId, "342.00", "cs_test_two");
    await deliver(JSON.stringify(completedEvent(invoiceId, 34200, { eventId: "evt_a" })));
    const second = await deliver(
      JSON.stringify(
        completedEvent(invoiceId, 34200, { eventId: "evt_c", sessionId: "cs_test_two" }),
      ),
    );
    expect(second.body).toEqual({
      received: true,
      outcome: "to-reconcile",
      reason: "invoice-settled",
    });
    // A repeat of that second payment's news keeps nothing more.
    const again = await deliver(
      JSON.stringify(
        completedEvent(invoiceId, 34200, { eventId: "evt_d", sessionId: "cs_test_two" }),
      ),
    );
    expect(again.body.outcome).toBe("already-kept");
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
    expect((await invoice()).amountPaid).toBe("342.00");
    expect(await listUnappliedPayments(db, { invoiceId })).toMatchObject([
      {
        amount: "342.00",
        currency: "USD",
        reason: "invoice-settled",
        status: "open",
        sessionId: "cs_test_two",
        invoiceNumber: (await invoice()).number,
      },
    ]);
  });

  it("keeps a payment from a page opened before cash was taken: 342.00 paid where 332.00 is owed", async () => {
    // 342.00 owed; 10.00 cash at the counter leaves 342.00 − 10.00 = 332.00; the old page then
    // takes 342.00, which is more than is owed.
    await recordManualPayment(
      db,
      invoiceId,
      { method: "cash", amount: "10.00" },
      w.users.counter.id,
    );
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)));
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "over-owed" });
    expect(await invoice()).toMatchObject({ status: "issued", amountPaid: "10.00" });
    expect(await listUnappliedPayments(db, { status: "open" })).toMatchObject([
      { invoiceId, amount: "342.00", reason: "over-owed", reference: "pi_test_one" },
    ]);
    // The page is finished at the provider: it is never offered again.
    const session = await db
      .selectFrom("payment_sessions")
      .select(["status", "url"])
      .where("id", "=", "cs_test_one")
      .executeTakeFirstOrThrow();
    expect(session).toEqual({ status: "complete", url: null });
  });

  it("keeps a payment for a void invoice", async () => {
    await voidInvoice(db, invoiceId, null);
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)));
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "invoice-void" });
    expect(await tableRows("payments")).toBe(0);
    expect(await listUnappliedPayments(db)).toMatchObject([{ invoiceId, reason: "invoice-void" }]);
  });

  it("keeps a payment from a page we had closed", async () => {
    await markPaymentSessionExpired(db, "cs_test_one");
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 34200)));
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "session-closed" });
    expect((await invoice()).status).toBe("issued");
  });
});

describe("the webhook believes our stored session, not the event's invoice and amount", () => {
  it("does not pay another invoice named in the event: kept on the session's own invoice", async () => {
    const other = await issued(w.otherJob.id);
    // Signed, for our session cs_test_one (opened for invoiceId), but naming the other invoice.
    const res = await deliver(JSON.stringify(completedEvent(other, 34200)));
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "invoice-mismatch" });
    expect(await invoice(other)).toMatchObject({ status: "issued", amountPaid: "0.00" });
    expect(await invoice()).toMatchObject({ status: "issued", amountPaid: "0.00" });
    expect(await listUnappliedPayments(db)).toMatchObject([{ invoiceId, amount: "342.00" }]);
  });

  it("does not pay an invoice for a session we never opened: kept, tied to no invoice", async () => {
    const res = await deliver(
      JSON.stringify(completedEvent(invoiceId, 34200, { sessionId: "cs_test_not_ours" })),
    );
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "unknown-session" });
    expect((await invoice()).status).toBe("issued");
    expect(await listUnappliedPayments(db)).toMatchObject([
      { invoiceId: null, sessionId: "cs_test_not_ours", amount: "342.00" },
    ]);
    expect((await listPaymentEvents(db))[0]).toMatchObject({ invoice_id: null });
  });

  it("does not take a part payment whose amount is not its page's: 100.00 on a page for 342.00", async () => {
    const res = await deliver(JSON.stringify(completedEvent(invoiceId, 10000)));
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "amount-differs" });
    expect((await invoice()).amountPaid).toBe("0.00");
    expect(await listUnappliedPayments(db)).toMatchObject([{ amount: "100.00" }]);
  });

  it("does not apply a payment in another currency than its page's", async () => {
    const res = await deliver(
      JSON.stringify(completedEvent(invoiceId, 34200, { currency: "eur" })),
    );
    expect(res.body).toMatchObject({ outcome: "to-reconcile", reason: "currency-mismatch" });
    expect((await invoice()).status).toBe("issued");
    expect(await listUnappliedPayments(db)).toMatchObject([{ currency: "EUR" }]);
  });

  it("answers 200 for an event that is not a payment, and applies nothing", async () => {
    const event = { ...completedEvent(invoiceId, 34200), type: "customer.created" };
    const res = await deliver(JSON.stringify(event));
    expect(res).toEqual({ status: 200, body: { received: true, outcome: "ignored" } });
    expect(await tableRows("payments")).toBe(0);
  });
});
