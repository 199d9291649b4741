import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { DB } from "@/db/client";
import { findInvoiceById } from "@/db/invoices";
import { listPaymentsForInvoice } from "@/db/payments";
import { takeCounterPayment } from "@/lib/billing/counter-payments";
import { voidInvoice } from "@/lib/billing/invoices";
import { startCheckout } from "@/lib/payments/checkout";
import { type BillingWorld, issueBalancingInvoice, setUpBilling } from "../api/billing/fixtures";
import { freshDb } from "../helpers/db";
import { startProviderFakeForFile } from "./support";

// Money taken at the counter, or a void, closes the invoice's open payment page at the provider
// at once; when the provider cannot be reached the counter's work stands, the failure is kept on
// the page's row and the next checkout closes it.

const provider = startProviderFakeForFile();
const { atProvider, pay, pointAt: pointProviderAt } = provider;
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

const openPage = (invoiceId: number) =>
  startCheckout(db, invoiceId, w.users.customer, "http://localhost/api/checkout");

const sessionRow = (id: string) =>
  db
    .selectFrom("payment_sessions")
    .select(["status", "close_failed_at", "close_error"])
    .where("id", "=", id)
    .executeTakeFirstOrThrow();

describe("closing the online payment page when the invoice changes at the counter", () => {
  it("cash at the counter closes the open page at the provider at once, so it takes no money", async () => {
    const invoice = await issued();
    const page = await openPage(invoice.id);
    expect(page.amount).toBe("342.00");

    await takeCounterPayment(
      db,
      invoice.id,
      { method: "cash", amount: "10.00" },
      w.users.counter.id,
    );

    expect((await atProvider(page.sessionId)).status).toBe("expired");
    expect(await sessionRow(page.sessionId)).toEqual({
      status: "expired",
      close_failed_at: null,
      close_error: null,
    });
    const deliveries = provider.fake.deliveries.length;
    await pay(page.sessionId);
    expect(provider.fake.deliveries.length).toBe(deliveries); // nothing paid on the old page
    // 342.00 − 10.00 = 332.00 still owed, from the cash alone.
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({ amountPaid: "10.00" });
    expect(await listPaymentsForInvoice(db, invoice.id)).toHaveLength(1);
  });

  it("voiding the invoice closes its open page at the provider", async () => {
    const invoice = await issued();
    const page = await openPage(invoice.id);
    await voidInvoice(db, invoice.id, w.users.owner.id);
    expect((await atProvider(page.sessionId)).status).toBe("expired");
    expect((await sessionRow(page.sessionId)).status).toBe("expired");
  });

  it("records a provider out of reach without blocking the counter, and the next checkout closes the page", async () => {
    const invoice = await issued();
    const page = await openPage(invoice.id);
    const errors = vi.spyOn(console, "error").mockImplementation(() => {});
    pointProviderAt("http://127.0.0.1:9"); // nothing listens there

    const taken = await takeCounterPayment(
      db,
      invoice.id,
      { method: "cash", amount: "10.00" },
      w.users.counter.id,
    );
    expect(taken.payment.amount).toBe("10.00");
    expect(await findInvoiceById(db, invoice.id)).toMatchObject({ amountPaid: "10.00" });
    const pending = await sessionRow(page.sessionId);
    expect(pending.status).toBe("open");
    expect(pending.close_failed_at).not.toBeNull();
    expect(pending.close_error).toBeTruthy();
    expect(errors).toHaveBeenCalled();
    expect((await atProvider(page.sessionId)).status).toBe("open"); // still payable until retried

    // The provider is back: the next checkout (here for another invoice) closes it first.
    pointProviderAt(provider.fake.url);
    const other = await issued(w.otherJob.id);
    await startCheckout(db, other.id, w.otherCustomer, "http://localhost/api/checkout");
    expect((await atProvider(page.sessionId)).status).toBe("expired");
    expect(await sessionRow(page.sessionId)).toEqual({
      status: "expired",
      close_failed_at: null,
      close_error: null,
    });
  });

  it("voids the invoice when the provider is out of reach, and keeps the page to close later", async () => {
    const invoice = await issued();
    const page = await openPage(invoice.id);
    vi.spyOn(console, "error").mockImplementation(() => {});
    pointProviderAt("http://127.0.0.1:9");
    const voided = await voidInvoice(db, invoice.id, w.users.owner.id);
    expect(voided.status).toBe("void");
    expect((await sessionRow(page.sessionId)).close_failed_at).not.toBeNull();
  });
});
