import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as applyRoute } from "@/app/api/payments/unapplied/[id]/apply/route";
import { POST as refundRoute } from "@/app/api/payments/unapplied/[id]/refund/route";
import { GET as listRoute } from "@/app/api/payments/unapplied/route";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import { listPaymentsForInvoice, listUnappliedPayments } from "@/db/payments";
import { createInvoice, issueInvoice } from "@/lib/billing/invoices";
import { recordManualPayment } from "@/lib/billing/payments";
import { freshDb } from "../helpers/db";
import { jsonRequest, noParams, params } from "../helpers/http";
import { signInAs } from "../helpers/session";
import { type BillingWorld, setUpBilling } from "../api/billing/fixtures";
import { completedEvent, deliver, storeSession } from "./support";

// The invoice: BAL-I4 285.00 + 20 % tax 57.00 = 342.00.

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
  invoiceId = (await issueInvoice(db, draft.id, null)).id;
  await storeSession(db, invoiceId, "342.00");
  vi.spyOn(console, "warn").mockImplementation(() => {});
  vi.spyOn(console, "info").mockImplementation(() => {});
});

afterEach(() => vi.restoreAllMocks());

/** Keeps one online payment to reconcile by sending its signed notice; answers its row. */
async function kept(amountCents: number, sessionId = "cs_test_one") {
  const res = await deliver(JSON.stringify(completedEvent(invoiceId, amountCents, { sessionId })));
  expect(res.body.outcome).toBe("to-reconcile");
  const [item] = await listUnappliedPayments(db, { status: "open" });
  return item!;
}

/** What a route answered: the item and flags, or the error shape. */
interface Answer {
  item?: { status: string; version: number };
  paid?: boolean;
  error: { code: string; message: string; fields: Record<string, string> };
}

async function call(
  route: typeof applyRoute,
  id: number,
  body: unknown,
): Promise<{ status: number; body: Answer }> {
  const res = await route(
    jsonRequest("POST", `/api/payments/unapplied/${id}/x`, body),
    params({ id: String(id) }),
  );
  return { status: res.status, body: await res.json() };
}

const audit = (action: string) =>
  db.selectFrom("audit_log").selectAll().where("action", "=", action).execute();

describe("apply as payment", () => {
  it("puts a kept payment on its invoice where it fits what is owed, once, audited and versioned", async () => {
    // 100.00 taken on a page for 342.00 (kept: not its page's amount); 342.00 is owed, so it fits:
    // 342.00 − 100.00 = 242.00 still owed after.
    const item = await kept(10000);
    signInAs(w.users.counter);
    const res = await call(applyRoute, item.id, { version: item.version });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ paid: false, item: { status: "applied", version: 2 } });
    expect(await findInvoiceById(db, invoiceId)).toMatchObject({ amountPaid: "100.00" });
    const payments = await listPaymentsForInvoice(db, invoiceId);
    expect(payments).toMatchObject([
      { method: "online", amount: "100.00", providerSessionId: "cs_test_one" },
    ]);
    expect((await listUnappliedPayments(db))[0]).toMatchObject({
      status: "applied",
      paymentId: payments[0]!.id,
      resolvedBy: w.users.counter.id,
      resolvedByName: w.users.counter.name,
    });
    expect(await audit("online-payment-applied")).toHaveLength(1);
    expect(await audit("payment")).toHaveLength(1); // on the invoice, as any payment is

    // A second press (or a second person with the old version) changes nothing.
    const again = await call(applyRoute, item.id, { version: item.version });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe("This payment was already applied to its invoice.");
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(1);
  });

  it("refuses, saying why, a payment that is more than is owed: 342.00 where 332.00 is owed", async () => {
    // Cash 10.00 at the counter leaves 342.00 − 10.00 = 332.00 owed.
    await recordManualPayment(db, invoiceId, { method: "cash", amount: "10.00" }, null);
    const item = await kept(34200);
    expect(item.reason).toBe("over-owed");
    const number = (await findInvoiceById(db, invoiceId))!.number;
    signInAs(w.users.owner);
    const res = await call(applyRoute, item.id, { version: item.version });
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({
      code: "does_not_fit",
      message: `$342.00 is more than the $332.00 still owed on ${number}: refund it.`,
    });
    expect((await findInvoiceById(db, invoiceId))!.amountPaid).toBe("10.00");
    expect((await listUnappliedPayments(db))[0]!.status).toBe("open");
  });

  it("refuses a second payment for an invoice already paid, and one tied to no invoice", async () => {
    await storeSession(db, invoiceId, "342.00", "cs_test_two");
    await deliver(JSON.stringify(completedEvent(invoiceId, 34200)));
    const twice = await kept(34200, "cs_test_two");
    signInAs(w.users.counter);
    const paid = await call(applyRoute, twice.id, { version: 1 });
    expect(paid.status).toBe(409);
    expect(paid.body.error.message).toMatch(/^Nothing is owed on INV-\d{4}-\d{4}: it is paid\./);

    await deliver(JSON.stringify(completedEvent(invoiceId, 500, { sessionId: "cs_test_stray" })));
    const stray = (await listUnappliedPayments(db, { status: "open" })).find(
      (u) => u.sessionId === "cs_test_stray",
    )!;
    const none = await call(applyRoute, stray.id, { version: 1 });
    expect(none.status).toBe(409);
    expect(none.body.error.message).toBe("This payment belongs to no invoice of ours: refund it.");
  });

  it("refuses a stale version with 409", async () => {
    const item = await kept(10000);
    signInAs(w.users.counter);
    const res = await call(applyRoute, item.id, { version: item.version + 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("stale_write");
    expect((await findInvoiceById(db, invoiceId))!.amountPaid).toBe("0.00");
  });
});

describe("mark refunded", () => {
  it("needs a note, then closes the payment with it, audited; applying it after is refused", async () => {
    const item = await kept(10000);
    signInAs(w.users.counter);
    const bare = await call(refundRoute, item.id, { version: item.version, note: "  " });
    expect(bare.status).toBe(422);
    expect(bare.body.error.fields.note).toBe(
      "Write what was done: the refund's reference, or why.",
    );

    const res = await call(refundRoute, item.id, {
      version: item.version,
      note: "Refunded at the payment service, ref re_test_1",
    });
    expect(res.status).toBe(200);
    expect(res.body.item).toMatchObject({ status: "refunded", version: 2 });
    expect(await audit("online-payment-refunded")).toMatchObject([
      { user_id: w.users.counter.id, entity: "unapplied_payment", entity_id: String(item.id) },
    ]);
    const apply = await call(applyRoute, item.id, { version: 2 });
    expect(apply.status).toBe(409);
    expect(apply.body.error.message).toBe("This payment was already marked refunded.");
    expect(await listPaymentsForInvoice(db, invoiceId)).toHaveLength(0);
  });
});

describe("who sees and settles payments to reconcile", () => {
  it("lets the counter and the owner list them, by invoice; the machinist and the customer are refused", async () => {
    await kept(10000);
    signInAs(w.users.counter);
    const list = await listRoute(
      jsonRequest("GET", `/api/payments/unapplied?invoiceId=${invoiceId}`),
      noParams,
    );
    expect(list.status).toBe(200);
    expect((await list.json()).payments).toMatchObject([{ invoiceId, amount: "100.00" }]);
    const other = await listRoute(
      jsonRequest("GET", `/api/payments/unapplied?invoiceId=${invoiceId + 1}`),
      noParams,
    );
    expect((await other.json()).payments).toEqual([]);

    for (const user of [w.users.machinist, w.users.customer]) {
      signInAs(user);
      expect(
        (await listRoute(jsonRequest("GET", "/api/payments/unapplied"), noParams)).status,
      ).toBe(403);
      expect((await call(applyRoute, 1, { version: 1 })).status).toBe(403);
      expect((await call(refundRoute, 1, { version: 1, note: "x" })).status).toBe(403);
    }
    signInAs(null);
    expect((await call(applyRoute, 1, { version: 1 })).status).toBe(401);
    expect((await listUnappliedPayments(db))[0]!.status).toBe("open");
  });
});
